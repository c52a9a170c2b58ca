/** Workbench tools: convert text between notations, and every checksum of some bytes. */
import { computeChecksum, formatChecksumValue, listChecksumAlgorithms } from '../../lib/frame/checksum';
import { BytesInput, useBytesInput } from './BytesInput';
import { notationRows } from '../../lib/composer/notations';
import { NotationList } from './NotationList';
import { Section } from '../ui/Section';

// Marked pure: the workbench imports this module for the server's render only, and the browser loads it later (see Later).
const ALGORITHMS = /* @__PURE__ */ listChecksumAlgorithms();

export function Tools() {
  const input = useBytesInput();
  const { read } = input;
  const bytes = read?.ok ? read.bytes : null;
  return (
    <Section title="Convert and check" id="tools">
      <BytesInput input={input} id="conv" label="Bytes, in any notation" placeholder="e.g. 02 41 42 03 or 'AB$0D'" showLength />
      {bytes && (
        <div className="grid gap-4 lg:grid-cols-2 mt-3">
          <NotationList rows={notationRows(bytes)} />
          <table className="table" data-testid="checksums">
            <thead><tr><th>Checksum</th><th>Value</th></tr></thead>
            <tbody>
              {ALGORITHMS.map((a) => {
                const r = computeChecksum(a.name, bytes);
                return <tr key={a.name} data-algorithm={a.name}><td>{a.name}</td><td className="mono">{r.ok ? formatChecksumValue(r.value.value, r.value.width) : '–'}</td></tr>;
              })}
            </tbody>
          </table>
        </div>
      )}
    </Section>
  );
}
