/** The editing controls for one segment, by type. */
import { CUSTOM_CRC, defaultChecksumByteOrder, findChecksumAlgorithm, isCustomCrcName, listChecksumAlgorithms } from '../../lib/frame/checksum';
import type { ChecksumSegment, Segment, Template } from '../../lib/frame/template';
import { CONTROL_CHOICES, hexOfText, labelOfBytes, textOfHex } from '../../lib/composer/bytes-text';
import { isDegrees, scaleFromStepsPerRev, stepsPerRevOf } from '../../lib/composer/scaling';
import { HexInput, Labeled, NumInput } from './inputs';

const ALGORITHMS = listChecksumAlgorithms();
/** Starting point for own CRC parameters: CRC-16/XMODEM's, which the user then edits. */
const CUSTOM_START = { width: 16, poly: '0x1021', init: '0x0000', refin: false, refout: false, xorout: '0x0000' };

interface Props {
  seg: Segment;
  index: number;
  template: Template;
  onChange: (s: Segment) => void;
  rawUnit: string;
  onRawUnit: (unit: string) => void;
  readOnly: boolean;
}

export function SegmentFields({ seg, index, template, onChange, rawUnit, onRawUnit, readOnly }: Props) {
  const id = (k: string) => `seg-${seg.id}-${k}`;
  const ro = { readOnly, disabled: readOnly };
  if (seg.type === 'literal') {
    const text = textOfHex(seg.bytes);
    const control = CONTROL_CHOICES.find((c) => c.hex === seg.bytes.trim().toUpperCase());
    return (
      <div className="grid grid-cols-2 gap-2">
        {control ? (
          <Labeled id={id('ctl')} label="Control character" wide>
            <select id={id('ctl')} className="input !py-1" value={control.hex} {...ro}
              onChange={(e) => { const c = CONTROL_CHOICES.find((x) => x.hex === e.target.value)!; onChange({ ...seg, bytes: c.hex, label: c.name }); }}>
              {CONTROL_CHOICES.map((c) => <option key={c.hex} value={c.hex}>{c.name} ({c.hex})</option>)}
            </select>
          </Labeled>
        ) : (
          <Labeled id={id('text')} label="Text">
            <input id={id('text')} className="input !py-1 mono" value={text ?? ''} placeholder={text === null ? 'not printable: edit the hex' : ''} readOnly={readOnly || text === null}
              onChange={(e) => e.target.value && onChange({ ...seg, bytes: hexOfText(e.target.value), label: e.target.value })} />
          </Labeled>
        )}
        {!control && (
          <Labeled id={id('hex')} label="Bytes (hex)">
            <HexInput id={id('hex')} value={seg.bytes} readOnly={readOnly} onChange={(bytes) => onChange({ ...seg, bytes, label: labelOfBytes(bytes) })} />
          </Labeled>
        )}
      </div>
    );
  }
  if (seg.type === 'terminator') {
    return (
      <Labeled id={id('hex')} label={`Terminator bytes (hex): ${labelOfBytes(seg.bytes)}`}>
        <HexInput id={id('hex')} value={seg.bytes} readOnly={readOnly} onChange={(bytes) => onChange({ ...seg, bytes })} />
      </Labeled>
    );
  }
  if (seg.type === 'checksum') return <ChecksumFields seg={seg} index={index} template={template} onChange={onChange} readOnly={readOnly} />;
  const common = (
    <>
      <Labeled id={id('name')} label="Name (key)">
        <input id={id('name')} className="input !py-1 mono" value={seg.name} readOnly={readOnly} onChange={(e) => onChange({ ...seg, name: e.target.value })} />
      </Labeled>
      <Labeled id={id('label')} label="Label">
        <input id={id('label')} className="input !py-1" value={seg.label} readOnly={readOnly} onChange={(e) => onChange({ ...seg, label: e.target.value })} />
      </Labeled>
    </>
  );
  if (seg.type === 'integer' || seg.type === 'decimal') {
    const spr = stepsPerRevOf(seg);
    return (
      <div className="grid grid-cols-2 gap-2">
        {common}
        <Labeled id={id('unit')} label="Unit">
          <input id={id('unit')} className="input !py-1" value={seg.unit ?? ''} readOnly={readOnly} placeholder="° or mm" onChange={(e) => onChange({ ...seg, unit: e.target.value || undefined })} />
        </Labeled>
        <Labeled id={id('raw')} label="Raw unit">
          <input id={id('raw')} className="input !py-1" value={rawUnit} readOnly={readOnly} placeholder="steps" onChange={(e) => onRawUnit(e.target.value)} />
        </Labeled>
        <Labeled id={id('factor')} label="Scale factor (raw per unit)">
          <NumInput id={id('factor')} value={seg.scale ? seg.scale.factor / (seg.scale.divisor ?? 1) : undefined} readOnly={readOnly} onChange={(f) => onChange({ ...seg, scale: f ? { factor: f, offset: seg.scale?.offset ?? 0 } : undefined })} />
        </Labeled>
        {isDegrees(seg.unit) ? (
          <Labeled id={id('spr')} label="Steps per revolution">
            <NumInput id={id('spr')} value={spr ?? undefined} min={1} readOnly={readOnly} onChange={(n) => onChange({ ...seg, scale: n ? scaleFromStepsPerRev(n) : undefined })} />
          </Labeled>
        ) : (
          <Labeled id={id('offset')} label="Offset (raw)">
            <NumInput id={id('offset')} value={seg.scale?.offset} readOnly={readOnly || !seg.scale} onChange={(o) => seg.scale && onChange({ ...seg, scale: { ...seg.scale, offset: o ?? 0 } })} />
          </Labeled>
        )}
        <Labeled id={id('sign')} label="Sign">
          <select id={id('sign')} className="input !py-1" value={seg.sign} {...ro} onChange={(e) => onChange({ ...seg, sign: e.target.value as never })}>
            <option value="negative">Only when negative</option><option value="always">Always (+ or -)</option>
          </select>
        </Labeled>
        <Labeled id={id('width')} label="Width (characters)">
          <NumInput id={id('width')} value={seg.width} integer min={1} readOnly={readOnly} onChange={(w) => onChange({ ...seg, width: w })} />
        </Labeled>
        <Labeled id={id('min')} label="Minimum">
          <NumInput id={id('min')} value={seg.min} readOnly={readOnly} onChange={(v) => onChange({ ...seg, min: v })} />
        </Labeled>
        <Labeled id={id('max')} label="Maximum">
          <NumInput id={id('max')} value={seg.max} readOnly={readOnly} onChange={(v) => onChange({ ...seg, max: v })} />
        </Labeled>
        {seg.type === 'decimal' && (
          <Labeled id={id('dec')} label="Decimals">
            <NumInput id={id('dec')} value={seg.decimals} integer min={0} allowEmpty={false} readOnly={readOnly} onChange={(d) => onChange({ ...seg, decimals: Math.min(9, d ?? 0) })} />
          </Labeled>
        )}
      </div>
    );
  }
  if (seg.type === 'text') {
    return (
      <div className="grid grid-cols-2 gap-2">
        {common}
        <Labeled id={id('max')} label="Longest (characters)">
          <NumInput id={id('max')} value={seg.maxLength} integer min={0} readOnly={readOnly} onChange={(v) => onChange({ ...seg, maxLength: v })} />
        </Labeled>
        <Labeled id={id('case')} label="Letter case">
          <select id={id('case')} className="input !py-1" value={seg.case} {...ro} onChange={(e) => onChange({ ...seg, case: e.target.value as never })}>
            <option value="as-is">As typed</option><option value="upper">Upper</option><option value="lower">Lower</option>
          </select>
        </Labeled>
      </div>
    );
  }
  const lines = seg.options.map((o) => `${o.value}=${o.send}`).join('\n');
  return (
    <div className="grid grid-cols-2 gap-2">
      {common}
      <Labeled id={id('opts')} label="Options, one per line: key=text sent" wide>
        <textarea id={id('opts')} className="input !py-1 mono" rows={3} defaultValue={lines} readOnly={readOnly}
          onChange={(e) => {
            const options = e.target.value.split('\n').map((l) => l.split('=')).filter((p) => p.length >= 2 && p[0]!.trim()).map(([value, ...send]) => ({ value: value!.trim(), send: send.join('=') }));
            if (options.length) onChange({ ...seg, options, default: options.some((o) => o.value === seg.default) ? seg.default : options[0]!.value });
          }} />
      </Labeled>
    </div>
  );
}

function ChecksumFields({ seg, index, template, onChange, readOnly }: { seg: ChecksumSegment; index: number; template: Template; onChange: (s: Segment) => void; readOnly: boolean }) {
  const id = (k: string) => `seg-${seg.id}-${k}`;
  const ro = { readOnly, disabled: readOnly };
  const before = template.segments.slice(0, index).map((s, i) => ({ i, s }));
  const custom = isCustomCrcName(seg.algorithm);
  const known = findChecksumAlgorithm(seg.algorithm);
  // A new algorithm or encoding brings the model's byte order (CRC-16/MODBUS in binary: low byte first).
  const change = (next: ChecksumSegment) => onChange({ ...next, byteOrder: defaultChecksumByteOrder(next) });
  const crc = seg.crc ?? CUSTOM_START;
  const setCrc = (p: Partial<typeof crc>) => onChange({ ...seg, crc: { ...crc, ...p } });
  return (
    <div className="grid grid-cols-2 gap-2">
      <Labeled id={id('alg')} label="Algorithm">
        <select id={id('alg')} className="input !py-1" value={custom ? CUSTOM_CRC : known?.name ?? seg.algorithm} {...ro}
          onChange={(e) => {
            const algorithm = e.target.value;
            const { crc: _crc, ...rest } = seg;
            change(isCustomCrcName(algorithm) ? { ...rest, algorithm, crc: seg.crc ?? CUSTOM_START } : { ...rest, algorithm });
          }}>
          {ALGORITHMS.map((a) => <option key={a.name} value={a.name}>{a.name}</option>)}
          <option value={CUSTOM_CRC}>Custom CRC (own parameters)</option>
        </select>
        {known && known.aliases.length > 0 && <p className="text-xs text-muted mt-1">Also called {known.aliases.join(', ')}</p>}
      </Labeled>
      <Labeled id={id('enc')} label="Sent as">
        <select id={id('enc')} className="input !py-1" value={seg.encoding} {...ro} onChange={(e) => change({ ...seg, encoding: e.target.value as never })}>
          <option value="binary">Binary bytes</option><option value="ascii-hex">Hex characters</option><option value="ascii-decimal">Decimal characters</option>
        </select>
      </Labeled>
      {custom && (
        <>
          <Labeled id={id('width')} label="Width (bits, 1-32)">
            <NumInput id={id('width')} value={crc.width} integer min={1} allowEmpty={false} readOnly={readOnly} onChange={(w) => setCrc({ width: w ?? 16 })} />
          </Labeled>
          <Labeled id={id('poly')} label="Polynomial (hex, normal form)">
            <input id={id('poly')} className="input !py-1 mono" value={crc.poly} readOnly={readOnly} onChange={(e) => setCrc({ poly: e.target.value.trim() })} />
          </Labeled>
          <Labeled id={id('init')} label="Initial value (hex)">
            <input id={id('init')} className="input !py-1 mono" value={crc.init} readOnly={readOnly} onChange={(e) => setCrc({ init: e.target.value.trim() })} />
          </Labeled>
          <Labeled id={id('xorout')} label="Final XOR (hex)">
            <input id={id('xorout')} className="input !py-1 mono" value={crc.xorout} readOnly={readOnly} onChange={(e) => setCrc({ xorout: e.target.value.trim() })} />
          </Labeled>
          <div className="col-span-2 flex flex-wrap gap-4 text-sm">
            <label className="flex items-center gap-2"><input type="checkbox" checked={crc.refin} {...ro} onChange={(e) => setCrc({ refin: e.target.checked })} />Bytes read low bit first (refin)</label>
            <label className="flex items-center gap-2"><input type="checkbox" checked={crc.refout} {...ro} onChange={(e) => setCrc({ refout: e.target.checked })} />Result reflected (refout)</label>
          </div>
        </>
      )}
      <Labeled id={id('from')} label="Covers from">
        <select id={id('from')} className="input !py-1" value={String(seg.range.from)} {...ro}
          onChange={(e) => onChange({ ...seg, range: { ...seg.range, from: e.target.value === 'start' ? 'start' : Number(e.target.value) } })}>
          <option value="start">Frame start</option>
          {before.map(({ i, s }) => <option key={s.id} value={i}>#{i + 1} {s.type}</option>)}
        </select>
      </Labeled>
      <Labeled id={id('to')} label="Covers to">
        <select id={id('to')} className="input !py-1" value={String(seg.range.to)} {...ro}
          onChange={(e) => onChange({ ...seg, range: { ...seg.range, to: e.target.value === 'checksum' ? 'checksum' : Number(e.target.value) } })}>
          <option value="checksum">Just before the checksum</option>
          {before.map(({ i, s }) => <option key={s.id} value={i}>#{i + 1} {s.type}</option>)}
        </select>
      </Labeled>
      <Labeled id={id('over')} label="Computed over">
        <select id={id('over')} className="input !py-1" value={seg.over ?? 'bytes'} {...ro} onChange={(e) => onChange({ ...seg, over: e.target.value as never })}>
          <option value="bytes">The bytes as sent</option><option value="decoded-hex">The bytes the hex text stands for (Modbus ASCII)</option>
        </select>
      </Labeled>
      <Labeled id={id('order')} label="Byte order">
        <select id={id('order')} className="input !py-1" value={seg.byteOrder ?? defaultChecksumByteOrder(seg)} {...ro} onChange={(e) => onChange({ ...seg, byteOrder: e.target.value as never })}>
          <option value="high-first">High byte first</option><option value="low-first">Low byte first</option>
        </select>
      </Labeled>
    </div>
  );
}
