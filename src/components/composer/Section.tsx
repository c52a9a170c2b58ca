import type { ReactNode } from 'react';

/** A titled card; every composer panel is one. */
export function Section({ title, id, children, aside }: { title: string; id: string; children: ReactNode; aside?: ReactNode }) {
  return (
    <section className="card min-w-0" aria-labelledby={`${id}-title`} data-testid={id}>
      <div className="flex flex-wrap items-baseline justify-between gap-2 mb-2">
        <h2 id={`${id}-title`}>{title}</h2>
        {aside}
      </div>
      {children}
    </section>
  );
}
