import type { TimingSummary } from '../../lib/composer/timing';

export function TimingPanel({ timing }: { timing: TimingSummary }) {
  return (
    <table className="table" data-testid="timing-table">
      <caption className="text-left text-sm text-muted pb-1">At {timing.shorthand}</caption>
      <tbody>
        {timing.rows.map((r) => (
          <tr key={r.id} data-timing={r.id}>
            <th scope="row" className="!text-ink !font-medium">{r.label}</th>
            <td className="mono whitespace-nowrap">{r.value}</td>
            <td className="text-xs text-muted hidden sm:table-cell">{r.how}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
