/** Edit or add one port: line settings, control lines, RS-485 options, timing, protocol, frame rules, wiring and notes. */
import { useState } from 'react';
import { useFieldArray, useForm, type UseFormRegister } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, ApiError, isStale } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { changedFields, changedPaths, reapply, showValue } from '../../lib/client/conflict';
import { useConflict } from '../../lib/client/use-conflict';
import { portInputSchema, type PortInput } from '../../lib/schemas/vault';
import {
  alignControlLines, CTS_MODES, defaultPortSettings, DTR_MODES, HANDSHAKES, INTERFACES, PARITIES, PROTOCOLS, RS485_DIRECTIONS, RTS_MODES, STANDARD_BAUD_RATES,
} from '../../lib/frame/port-settings';
import {
  CONTROL_LINE_LABELS, CTS_MODE_LABELS, DTR_MODE_LABELS, HANDSHAKE_LABELS, INTERFACE_LABELS, PARITY_LABELS, PROTOCOL_LABELS, RS485_DIRECTION_LABELS, RTS_MODE_LABELS,
} from '../../lib/frame/port-text';
import { BYTE_SETS } from '../../lib/frame/frame-rules';
import { FormField } from '../FormField';
import { ConflictNotice } from '../ui/ConflictNotice';
import { ErrorNotice, useUnsavedGuard } from './shared';
import { Caution } from '../ui/Caution';
import { dirtyPaths, getPath } from './paths';
import { LABELS, portPartLabel, portPartValue, portShape } from './port-parts';

export interface PortRecord extends PortInput { id: string; version: number; shorthand: string; text: string }

const optNumber = (v: unknown) => (v === '' || v === null || v === undefined || Number.isNaN(v) ? undefined : Number(v));
const nullNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const optText = (v: unknown) => (v === '' || v === null ? undefined : v);

interface Props {
  port?: PortRecord;
  /** Saves through the port API; leave out and pass `onSave` for ports kept inside a profile. */
  deviceId?: string;
  /**
   * Saves elsewhere (a profile's ports): gets the whole port and the paths the user changed. A 409 is then the
   * caller's to show (it compares the whole list); the form closes.
   */
  onSave?(value: PortInput, changed: string[][]): Promise<unknown>;
  onDone(): void;
}

/** A save of an existing port: the version it is based on, that version and mine (only their differences are sent). */
interface Attempt { version: number; base: PortInput; mine: PortInput }

export function PortForm({ port, deviceId, onSave, onDone }: Props) {
  const qc = useQueryClient();
  const start: PortInput = port ? portShape(port) : { name: '', settings: defaultPortSettings, wiring: [], notes: '' };
  const [base, setBase] = useState(port);
  const conflicts = useConflict<PortInput, PortRecord>(portShape);
  const conflict = conflicts.conflict;
  const form = useForm<PortInput>({ resolver: zodResolver(portInputSchema) as never, defaultValues: start });
  const wiring = useFieldArray({ control: form.control, name: 'wiring' });
  const { errors, isDirty } = form.formState;
  useUnsavedGuard(isDirty);
  const iface = form.watch('settings.interface');
  type ControlKey = 'handshake' | 'rs485Direction' | 'rtsMode' | 'ctsMode' | 'dtrMode';
  // Handshake and RS-485 direction say some of what the control lines say; moving one moves the others to agree.
  const align = (changed: ControlKey) => () => {
    const now = form.getValues('settings');
    const next = alignControlLines(now, changed);
    for (const k of ['handshake', 'rs485Direction', 'rtsMode', 'ctsMode', 'dtrMode'] as const) {
      if (next[k] !== now[k]) form.setValue(`settings.${k}`, next[k] as never, { shouldDirty: true });
    }
  };

  const save = useMutation({
    mutationFn: ({ value, changed, attempt }: { value: PortInput; changed: string[][]; attempt?: Attempt }) =>
      onSave ? onSave(value, changed)
        : attempt ? api<PortRecord>(`/api/ports/${base!.id}`, { method: 'PATCH', body: { version: attempt.version, ...changedFields(attempt.mine, changedPaths(attempt.base, attempt.mine)) } })
        : api<PortRecord>('/api/ports', { body: { deviceId, ...value } }),
    onSuccess: () => {
      form.reset(form.getValues());
      conflicts.clear();
      qc.invalidateQueries({ queryKey: vaultKeys.all() });
      onDone();
    },
    onError: (err, { attempt }) => {
      if (isStale(err) && onSave) onDone();
      else if (attempt && conflicts.take(err, attempt.base, attempt.mine)) return;
      else if (err instanceof ApiError) for (const [k, message] of Object.entries(err.fields)) form.setError(k as never, { message });
    },
  });

  const submit = form.handleSubmit((v) => {
    const changed = dirtyPaths(form.formState.dirtyFields).map((p) => p.split('.'));
    if (onSave || !base) return save.mutate({ value: v, changed });
    const opened = portShape(base);
    // Mine is what I opened with only the parts I touched taken from the form.
    save.mutate({ value: v, changed, attempt: { version: base.version, base: opened, mine: reapply(v, opened, changed) } });
  });

  const f = (name: string) => `port-${port?.id ?? 'new'}-${name.replace(/\./g, '-')}`;
  const err = (path: string): string | undefined => (getPath(errors, `${path}.message`) as string | undefined) ?? undefined;
  return (
    <form onSubmit={submit} noValidate aria-label={port ? `Edit port ${port.name}` : 'Add a port'} className="grid gap-3 border-t border-line pt-3 mt-3">
      <Caution />
      <div className="grid gap-x-3 sm:grid-cols-3">
        <FormField id={f('name')} label="Port name" error={err('name')}><input id={f('name')} className="input" {...form.register('name')} /></FormField>
        <Select reg={form.register} id={f('interface')} name="settings.interface" label="Electrical interface" options={INTERFACES.map((i) => [i, INTERFACE_LABELS[i]])} />
        <FormField id={f('baud')} label="Baud rate" error={err('settings.baud')} hint="Standard rates offered; any positive rate allowed">
          <input id={f('baud')} className="input mono" list="baud-rates" inputMode="numeric" {...form.register('settings.baud', { setValueAs: (v) => (v === '' ? NaN : Number(v)) })} />
        </FormField>
        <datalist id="baud-rates">{STANDARD_BAUD_RATES.map((b) => <option key={b} value={b} />)}</datalist>
        <Select reg={form.register} id={f('dataBits')} name="settings.dataBits" label="Data bits" options={[5, 6, 7, 8].map((n) => [n, String(n)])} number />
        <Select reg={form.register} id={f('parity')} name="settings.parity" label="Parity" options={PARITIES.map((p) => [p, PARITY_LABELS[p]])} />
        <Select reg={form.register} id={f('stopBits')} name="settings.stopBits" label="Stop bits" options={[[1, '1'], [1.5, '1.5'], [2, '2']]} number />
        <Select reg={form.register} id={f('handshake')} name="settings.handshake" label="Handshaking" options={HANDSHAKES.map((h) => [h, HANDSHAKE_LABELS[h]])} onChange={align('handshake')} />
        <Select reg={form.register} id={f('protocol')} name="settings.protocol" label="Protocol" options={PROTOCOLS.map((p) => [p, PROTOCOL_LABELS[p]])} />
        <FormField id={f('addr')} label="Node address" error={err('settings.nodeAddress')} hint="Blank when the protocol has none">
          <input id={f('addr')} className="input mono" inputMode="numeric" {...form.register('settings.nodeAddress', { setValueAs: nullNumber })} />
        </FormField>
        {iface === 'tcp' && (
          <>
            <FormField id={f('host')} label="TCP host" error={err('settings.tcpHost')}><input id={f('host')} className="input mono" {...form.register('settings.tcpHost', { setValueAs: optText })} /></FormField>
            <FormField id={f('tcpport')} label="TCP port" error={err('settings.tcpPort')}><input id={f('tcpport')} className="input mono" inputMode="numeric" {...form.register('settings.tcpPort', { setValueAs: optNumber })} /></FormField>
          </>
        )}
      </div>
      {iface?.startsWith('rs485') && (
        <fieldset className="grid gap-x-3 sm:grid-cols-3 items-end">
          <legend className="font-semibold text-sm mb-1">RS-485</legend>
          <Select reg={form.register} id={f('dir')} name="settings.rs485Direction" label="Direction control" options={RS485_DIRECTIONS.map((d) => [d, RS485_DIRECTION_LABELS[d]])} onChange={align('rs485Direction')} />
          <label className="flex items-center gap-2 mb-3"><input type="checkbox" {...form.register('settings.termination')} /> Termination on at this device</label>
          <label className="flex items-center gap-2 mb-3"><input type="checkbox" {...form.register('settings.bias')} /> Bias on at this device</label>
        </fieldset>
      )}
      {iface !== 'tcp' && (
        <fieldset className="grid gap-x-3 sm:grid-cols-3 items-start">
          <legend className="font-semibold text-sm mb-1">Control lines</legend>
          <Select reg={form.register} id={f('rts')} name="settings.rtsMode" label={CONTROL_LINE_LABELS.rtsMode} options={RTS_MODES.map((m) => [m, RTS_MODE_LABELS[m]])} onChange={align('rtsMode')} />
          <Select reg={form.register} id={f('cts')} name="settings.ctsMode" label={CONTROL_LINE_LABELS.ctsMode} options={CTS_MODES.map((m) => [m, CTS_MODE_LABELS[m]])} onChange={align('ctsMode')} />
          <Select reg={form.register} id={f('dtr')} name="settings.dtrMode" label={CONTROL_LINE_LABELS.dtrMode} options={DTR_MODES.map((m) => [m, DTR_MODE_LABELS[m]])} onChange={align('dtrMode')} />
          {([['rtsLeadMs', `${CONTROL_LINE_LABELS.rtsLeadMs} (ms)`, 'Before the first start bit'], ['rtsTailMs', `${CONTROL_LINE_LABELS.rtsTailMs} (ms)`, 'After the transmit buffer empties']] as const).map(([k, label, hint]) => (
            <FormField key={k} id={f(k)} label={label} error={err(`settings.${k}`)} hint={hint}>
              <input id={f(k)} className="input mono" inputMode="decimal" {...form.register(`settings.${k}`, { setValueAs: (v) => (v === '' ? NaN : Number(v)) })} />
            </FormField>
          ))}
          <label className="flex items-center gap-2 mb-3 sm:mt-8"><input type="checkbox" {...form.register('settings.echo')} /> Hears its own transmission (echo)</label>
          {(err('settings.handshake') || err('settings.rs485Direction')) && <p className="field-error sm:col-span-3" role="alert">{err('settings.handshake') ?? err('settings.rs485Direction')}</p>}
        </fieldset>
      )}
      <fieldset className="grid gap-x-3 grid-cols-2 sm:grid-cols-4">
        <legend className="font-semibold text-sm mb-1">Timing</legend>
        {([['responseTimeoutMs', 'Response timeout (ms)'], ['interCharTimeoutMs', 'Inter-character timeout (ms)'], ['turnaroundDelayMs', 'Turnaround delay (ms)'], ['retries', 'Retries']] as const).map(([k, label]) => (
          <FormField key={k} id={f(k)} label={label} error={err(`settings.${k}`)}>
            <input id={f(k)} className="input mono" inputMode="decimal" {...form.register(`settings.${k}`, { setValueAs: (v) => (v === '' ? NaN : Number(v)) })} />
          </FormField>
        ))}
      </fieldset>
      <fieldset className="grid gap-x-3 grid-cols-2 sm:grid-cols-5">
        <legend className="font-semibold text-sm mb-1">Frame rules of this device</legend>
        <FormField id={f('start')} label="Start bytes (hex)" error={err('settings.frameRules.start')}><input id={f('start')} className="input mono" placeholder="e.g. 02" {...form.register('settings.frameRules.start', { setValueAs: optText })} /></FormField>
        <FormField id={f('term')} label="Terminator (hex)" error={err('settings.frameRules.terminator')}><input id={f('term')} className="input mono" placeholder="e.g. 0D 0A" {...form.register('settings.frameRules.terminator', { setValueAs: optText })} /></FormField>
        <FormField id={f('max')} label="Maximum length" error={err('settings.frameRules.maxLength')}><input id={f('max')} className="input mono" inputMode="numeric" {...form.register('settings.frameRules.maxLength', { setValueAs: optNumber })} /></FormField>
        <Select reg={form.register} id={f('bytes')} name="settings.frameRules.byteSet" label="Allowed bytes" options={BYTE_SETS.map((b) => [b, LABELS.byteSet[b]])} />
        <Select reg={form.register} id={f('case')} name="settings.frameRules.letterCase" label="Letter case" options={(['any', 'upper', 'lower'] as const).map((c) => [c, LABELS.letterCase[c]])} />
      </fieldset>
      <fieldset>
        <legend className="font-semibold text-sm mb-1">Connector and wiring</legend>
        {wiring.fields.map((w, i) => (
          <div key={w.id} className="grid grid-cols-[4rem_1fr_1fr_auto] gap-2 mb-2 items-center">
            <input aria-label={`Pin, row ${i + 1}`} className="input mono" placeholder="Pin" {...form.register(`wiring.${i}.pin`)} />
            <input aria-label={`Signal, row ${i + 1}`} className="input" placeholder="Signal" {...form.register(`wiring.${i}.signal`)} />
            <input aria-label={`Wire colour, row ${i + 1}`} className="input" placeholder="Wire colour" {...form.register(`wiring.${i}.colour`)} />
            <button type="button" className="btn btn-quiet btn-sm" aria-label={`Remove row ${i + 1}`} onClick={() => wiring.remove(i)}>✕</button>
          </div>
        ))}
        <button type="button" className="btn btn-quiet btn-sm" onClick={() => wiring.append({ pin: '', signal: '', colour: '' })}>Add wiring row</button>
      </fieldset>
      <FormField id={f('notes')} label="Notes" error={err('notes')}><textarea id={f('notes')} rows={2} className="input" {...form.register('notes')} /></FormField>
      {conflict && (
        <ConflictNotice noun="port" version={conflict.version} rows={conflict.rows} label={portPartLabel}
          show={(p, v) => portPartValue(p, v) ?? showValue(v)} busy={save.isPending}
          onReapply={() => save.mutate({ value: conflict.merged, changed: conflict.minePaths, attempt: { version: conflict.version, base: conflict.theirs, mine: conflict.merged } })}
          onDiscard={() => { setBase(conflict.current); form.reset(portShape(conflict.current)); conflicts.clear(); }} />
      )}
      {save.isError && !conflict && <ErrorNotice error={save.error} />}
      {errors.root && <p className="field-error" role="alert">{errors.root.message}</p>}
      <div className="flex flex-wrap gap-2">
        <button className="btn" disabled={save.isPending}>{port ? 'Save port' : 'Add port'}</button>
        <button type="button" className="btn btn-quiet" onClick={() => (!isDirty || confirm('Drop your changes to this port?')) && (form.reset(), onDone())}>Cancel</button>
      </div>
    </form>
  );
}

function Select({ reg, id, name, label, options, number, onChange }: {
  reg: UseFormRegister<PortInput>; id: string; name: string; label: string; options: readonly (readonly [string | number, string])[]; number?: boolean; onChange?(): void;
}) {
  return (
    <FormField id={id} label={label}>
      <select id={id} className="input" {...reg(name as never, { ...(number ? { setValueAs: (v: unknown) => Number(v) } : {}), ...(onChange ? { onChange } : {}) })}>
        {options.map(([v, l]) => <option key={String(v)} value={v}>{l}</option>)}
      </select>
    </FormField>
  );
}
