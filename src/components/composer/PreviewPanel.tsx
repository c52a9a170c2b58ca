/** Live preview: byte cells, counts, every notation with copy buttons, and the findings. */
import { useMemo, useState } from 'react';
import type { FramePreview } from '../../lib/frame/preview';
import type { Template } from '../../lib/frame/template';
import type { WordByteOrder } from '../../lib/frame/notations/register-words';
import { byteCells } from '../../lib/composer/cells';
import { notationRows } from '../../lib/composer/notations';
import { ByteCells } from './ByteCells';
import { FindingsList } from './FindingsList';
import { NotationList } from './NotationList';

/** The frame against the machine's PLC STRING: its length in characters (one per byte), the widest case, the capacity. */
export interface PlcStringLine {
  capacity: number;
  length: number;
  longestLength: number | null;
}

export function PreviewPanel({ preview, template, plcString }: { preview: FramePreview; template: Template; plcString?: PlcStringLine | null }) {
  const [highlight, setHighlight] = useState<[number, number] | null>(null);
  const [order, setOrder] = useState<WordByteOrder>('high-first');
  const cells = useMemo(() => byteCells(preview.bytes, preview.segments, template, preview.findings), [preview, template]);
  const rows = useMemo(() => notationRows(preview.bytes, order), [preview.bytes, order]);
  const literal = rows[0]!.text;
  return (
    <div className="grid gap-4">
      <p className="text-sm" data-testid="counts">
        <b data-testid="byte-count">{preview.byteCount}</b> bytes on the wire · <b data-testid="char-count">{literal.length}</b> characters in the PLC literal
      </p>
      {plcString && (
        <p className="text-sm" data-testid="plc-string-fit">
          <b>{plcString.length}</b> of the <b>{plcString.capacity}</b> characters the machine's PLC STRING holds
          {' · '}{plcString.longestLength === null ? 'no upper length (a text field has no maximum)' : <>up to <b>{plcString.longestLength}</b> with every field at its widest</>}
        </p>
      )}
      <ByteCells cells={cells} highlight={highlight} />
      <div>
        <h3 className="font-semibold mb-1">Findings</h3>
        <FindingsList findings={preview.findings} onHighlight={setHighlight} empty="No findings: the frame follows the port's frame rules." />
      </div>
      <div>
        <div className="flex flex-wrap items-center justify-between gap-2 mb-2">
          <h3 className="font-semibold">Notations</h3>
          <label className="text-sm flex items-center gap-2">Register byte order
            <select className="input !py-1 !w-auto" value={order} onChange={(e) => setOrder(e.target.value as WordByteOrder)}>
              <option value="high-first">First byte high</option>
              <option value="low-first">First byte low</option>
            </select>
          </label>
        </div>
        <NotationList rows={rows} />
      </div>
    </div>
  );
}
