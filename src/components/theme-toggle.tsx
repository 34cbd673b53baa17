import { useTheme } from '@/lib/theme';

/** Switches between light and hall (dark) mode; the choice is remembered on this device. */
export function ThemeToggle({ className = '' }: { className?: string }) {
  const { theme, toggle } = useTheme();
  const hall = theme === 'hall';
  return (
    <button
      type="button"
      onClick={toggle}
      aria-pressed={hall}
      className={`inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded-lg border-2 border-header-muted px-3 text-sm font-bold text-header-fg hover:bg-white/10 ${className}`}
    >
      <span aria-hidden>{hall ? '☾' : '☀'}</span>
      Hall mode
    </button>
  );
}
