import type { ReactNode } from 'react';

/** A titled card: every composer and vault panel is one. `actions` sit beside the title. */
export function Section({ title, id, actions, children }: { title: string; id?: string; actions?: ReactNode; children: ReactNode }) {
  return (
    <section className="card min-w-0" aria-labelledby={id ? `${id}-title` : undefined} data-testid={id}>
      <div className="flex flex-wrap items-baseline justify-between gap-2 mb-3">
        <h2 id={id ? `${id}-title` : undefined}>{title}</h2>
        {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
      </div>
      {children}
    </section>
  );
}
