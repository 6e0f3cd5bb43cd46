import { isoColour } from '../../lib/rules/core';

/** An ISO size chip in the size's ISO colour with the number on it; designations plain. */
export function IsoChip(props: { size: string; selected: boolean; onTap: () => void; testId?: string }) {
  const c = isoColour(props.size);
  const style = c ? { background: c.hex, color: c.textHex } : undefined;
  return (
    <button
      type="button"
      aria-pressed={props.selected}
      aria-label={c ? `size ${props.size} (${c.name})` : `size ${props.size}`}
      data-testid={props.testId ?? `size-${props.size}`}
      onClick={props.onTap}
      style={style}
      className={`min-h-14 min-w-14 px-3 rounded-lg border-2 text-lg font-bold tabular ${
        props.selected ? 'border-ink ring-4 ring-gutta' : 'border-muted'
      } ${c ? '' : props.selected ? 'bg-ink text-white' : 'bg-white text-ink'}`}
    >
      {props.selected && <span aria-hidden="true">✓</span>}
      {props.size}
    </button>
  );
}

/** A small inline size badge (in lists and the diagram legend). */
export function IsoBadge({ size }: { size: string }) {
  const c = isoColour(size);
  return (
    <span
      className="inline-block px-2 rounded border border-muted font-bold tabular"
      style={c ? { background: c.hex, color: c.textHex } : undefined}
    >
      {size}
    </span>
  );
}
