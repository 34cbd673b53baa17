import { memo } from 'react';
export interface LevelSwitcherProps {
  levels: ReadonlyArray<{ id: string; name: string }>;
  activeId: string | null;
  onChoose: (levelId: string) => void;
}

/** One 48 px button per level, bottom floor first. */
export const LevelSwitcher = memo(function LevelSwitcher({ levels, activeId, onChoose }: LevelSwitcherProps) {
  return (
    <div role="group" aria-label="Level" className="flex gap-2 overflow-x-auto pb-1">
      {levels.map((l) => (
        <button
          key={l.id}
          type="button"
          aria-pressed={l.id === activeId}
          onClick={() => onChoose(l.id)}
          className={`min-h-touch shrink-0 rounded-lg border-2 px-4 font-bold ${l.id === activeId ? 'border-accent bg-accent text-accent-fg' : 'border-field-border bg-surface text-fg'}`}
        >
          {l.name}
        </button>
      ))}
    </div>
  );
});
