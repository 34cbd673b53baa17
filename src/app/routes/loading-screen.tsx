export function LoadingScreen({ label = 'Opening Fringewalk…' }: { label?: string }) {
  return (
    <div className="flex min-h-dvh items-center justify-center bg-bg text-fg" role="status" aria-live="polite">
      <p className="text-lg font-bold">{label}</p>
    </div>
  );
}
