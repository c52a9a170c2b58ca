/**
 * The live link panel, on a device page (LiveLinkPanel) and on the workbench (WorkbenchLivePanel), both loaded on
 * demand: pick a port, connect through Web Serial or to the simulated device, send commands, presets or typed
 * bytes, watch replies decoded, set and read control lines, search the framing, and keep the exchange log (saved to
 * the field log only on a device).
 */
import { useEffect, useMemo, useReducer, useRef, useState } from 'react';
import type { PortSettings } from '../../lib/frame/port-settings';
import { lineShorthand, portShorthand } from '../../lib/frame/port-text';
import type { Template } from '../../lib/frame/template';
import { createFakeSerial, type FakeSerial } from '../../lib/live/fake-serial';
import { openPlan, serialUnavailable, type SerialLike, type SerialPortLike } from '../../lib/live/serial';
import { LiveLink, type Exchange } from '../../lib/live/session';
import { liveSequences, runSequence, type LiveSequence, type SequenceRun } from '../../lib/live/sequence-send';
import type { SequenceMode } from '../../lib/frame/sequence-limits';
import { SequenceRunView } from './SequenceRunView';
import { exchangeLogText } from '../../lib/live/exchange-log';
import { ControlLines } from './ControlLines';
import { ExchangeView } from './ExchangeView';
import { FramingSearch } from './FramingSearch';
import { simulatedCommands, type LibraryCommand } from './library';
import { ExchangeLogDownload, SaveEvidence } from './SaveEvidence';
import { SendPanel } from './SendPanel';
import { SimulatorControls } from './SimulatorControls';
import { ExchangeLogView } from './ExchangeLogView';

type Through = 'port' | 'simulator';
const THROUGH_TEXT: Record<Through, string> = { port: 'a serial port', simulator: 'the simulated device (no hardware)' };

type Sent = { id: number; atMs: number } & ({ x: Exchange; replyTemplate: Template | null } | { run: SequenceRun });

/** `navigator.serial` where the browser has it (typed here: the DOM library of this project does not declare it). */
function browserSerial(): { serial: SerialLike | undefined; secure: boolean } {
  const nav = navigator as Navigator & { serial?: SerialLike };
  return { serial: nav.serial, secure: window.isSecureContext };
}

export interface LinkPanelProps {
  /** `DRV-501 Seamer drive`, or `Workbench`: names the exchange log. */
  label: string;
  ports: { name: string; settings: PortSettings }[];
  /** The commands to send and to simulate; null while they load. */
  commands: LibraryCommand[] | null;
  /** How the simulator's commands are named in words: "this device's commands". */
  commandsNoun: string;
  /** A device's: its exchange log may be saved to its field log (technicians and above). Null on the workbench. */
  fieldLog: { deviceId: string; canLog: boolean } | null;
}

export function LinkPanel({ label, ports, commands, commandsNoun, fieldLog }: LinkPanelProps) {
  const serialPorts = ports.filter((p) => p.settings.interface !== 'tcp');
  const [portName, setPortName] = useState(serialPorts[0]?.name ?? ports[0]?.name ?? '');
  const port = ports.find((p) => p.name === portName) ?? ports[0] ?? null;
  const plan = useMemo(() => (port ? openPlan(port.settings) : null), [port]);
  const library = useMemo(() => commands ?? [], [commands]);
  const [link, setLink] = useState<LiveLink | null>(null);
  const [open, setOpen] = useState(false);
  const [through, setThrough] = useState<Through>('port');
  const [fake, setFake] = useState<FakeSerial | null>(null);
  const serialPort = useRef<SerialPortLike | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [sent, setSent] = useState<Sent[]>([]);
  const [busy, setBusy] = useState(false);
  const [searching, setSearching] = useState(false);
  const [runningSequence, setRunningSequence] = useState(false);
  const stopSequence = useRef<AbortController | null>(null);
  const nextId = useRef(0);
  const sequences = useMemo(() => liveSequences(library), [library]);
  const [, redraw] = useReducer((n: number) => n + 1, 0);

  useEffect(() => link?.subscribe(redraw), [link]);
  // The simulated device follows the library as it changes (a command edited on the workbench while connected).
  useEffect(() => fake?.configure({ commands: simulatedCommands(library) }), [fake, library]);
  useEffect(() => () => { void link?.close().catch(() => undefined); }, [link]);

  const start = async (p: SerialPortLike): Promise<LiveLink> => {
    const l = await LiveLink.open(p, port!.settings);
    serialPort.current = p;
    setLink(l);
    setOpen(true);
    setSent([]);
    return l;
  };

  const connect = async (kind: Through) => {
    setError(null);
    if (!port) return;
    try {
      let serial: SerialLike;
      if (kind === 'port') {
        const b = browserSerial();
        const why = serialUnavailable({ serial: b.serial, isSecureContext: b.secure });
        if (why) throw new Error(why);
        serial = b.serial!;
      } else {
        const s = port.settings;
        const f = createFakeSerial({ line: { baud: s.baud, dataBits: s.dataBits, parity: s.parity, stopBits: s.stopBits }, commands: simulatedCommands(library), responseDelayMs: 5 });
        setFake(f);
        serial = f;
      }
      setThrough(kind);
      await start(await serial.requestPort());
    } catch (e) {
      const name = (e as { name?: string })?.name;
      setError(name === 'NotFoundError' ? 'No port was chosen.' : e instanceof Error ? e.message : String(e));
    }
  };

  const disconnect = async () => {
    if (!link) return;
    await link.close().catch(() => undefined);
    setOpen(false);
  };

  const send = async (bytes: Uint8Array, label: string, replyTemplate: Template | null) => {
    if (!link || busy) return;
    setBusy(true);
    setError(null);
    try {
      const atMs = link.elapsed();
      const x = await link.exchange(bytes, label, replyTemplate);
      setSent((list) => [{ id: nextId.current++, x, atMs, replyTemplate }, ...list]);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  };

  /** Sends a saved sequence (after the caller's machinery confirmation); its entry in the replies follows each step. */
  const sendSequence = async (seq: LiveSequence, mode: SequenceMode) => {
    if (!link || busy || searching) return;
    setBusy(true);
    setError(null);
    const id = nextId.current++;
    const atMs = link.elapsed();
    const stop = new AbortController();
    stopSequence.current = stop;
    setRunningSequence(mode === 'separate');
    const show = (run: SequenceRun) => setSent((list) => (list.some((s) => s.id === id) ? list.map((s) => (s.id === id ? { id, atMs, run } : s)) : [{ id, atMs, run }, ...list]));
    try {
      await runSequence(link, seq, { mode, signal: stop.signal, progress: show });
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      stopSequence.current = null;
      setRunningSequence(false);
      setBusy(false);
    }
  };

  const exchangeLog = () => (link && port ? exchangeLogText({
    device: label, port: port.name, line: lineShorthand(link.settings), through: THROUGH_TEXT[through], openedAt: link.openedAt, options: link.options,
  }, link.exchangeLog) : '');
  const settingsChanged = open && !!link && !!port && JSON.stringify(link.settings) !== JSON.stringify(port.settings);

  if (!ports.length) return <p className="text-sm text-muted">This device has no ports yet; add one with its settings first.</p>;

  return (
    <div className="grid gap-4" data-testid="live-panel">
      <div className="grid gap-2 sm:grid-cols-[1fr_auto] items-end">
        <div className="grid gap-1"><label className="label" htmlFor="live-port">Port</label>
          <select id="live-port" className="input" value={portName} disabled={open} onChange={(e) => setPortName(e.target.value)}>
            {ports.map((p) => <option key={p.name} value={p.name}>{p.name} · {portShorthand(p.settings)}</option>)}
          </select>
        </div>
        {open && <button type="button" className="btn btn-quiet" onClick={() => void disconnect()}>Disconnect</button>}
      </div>
      {plan && !plan.ok && (
        <div className="notice notice-bad" role="alert" data-testid="live-cannot-open">
          <p className="font-semibold">A browser cannot open this port with its stored settings:</p>
          <ul className="list-disc pl-5 text-sm">{plan.problems.map((p) => <li key={p}>{p}</li>)}</ul>
        </div>
      )}
      {!open && plan?.ok && plan.warnings.map((w) => <p key={w} className="notice notice-warn text-sm" data-testid="live-warning">{w}</p>)}
      {!open && plan?.ok && (
        <div className="grid gap-2">
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn" onClick={() => void connect('port')}>Connect to a serial port</button>
            <button type="button" className="btn btn-quiet" disabled={commands === null} onClick={() => void connect('simulator')}>Try it without hardware</button>
          </div>
          <p className="text-xs text-muted">
            The browser asks which adapter to use, then opens it at {lineShorthand(port!.settings)}. Without hardware, a simulated device answers {commandsNoun}
            with their reply templates.
          </p>
        </div>
      )}
      {error && <p className="notice notice-bad" role="alert" data-testid="live-error">{error}</p>}
      {open && link && port && (
        <>
          <p className="notice notice-ok" role="status" data-testid="live-connected">
            Connected through {THROUGH_TEXT[through]} at {lineShorthand(link.settings)}, flow control {link.options.flowControl}; response timeout {link.settings.responseTimeoutMs} ms.
          </p>
          {settingsChanged && <p className="notice notice-warn text-sm" role="status" data-testid="live-settings-changed">The port settings changed since the link opened; disconnect and connect again to use them.</p>}
          {/* Keyed by the link: a setup command may have changed the simulator's framing while the link was closed. */}
          {fake && through === 'simulator' && <SimulatorControls key={link.openedAt.getTime()} fake={fake} commands={library} />}
          <SendPanel library={library} busy={busy || searching} send={(b, l, t) => void send(b, l, t)}
            sequences={{
              sequences, running: runningSequence, blocked: searching ? 'A framing search has the port; send the sequence when it is done.' : null,
              send: (s, m) => void sendSequence(s, m), stop: () => stopSequence.current?.abort(),
            }} />
          {sent.length > 0 && (
            <div className="grid gap-2">
              <h3>Replies</h3>
              <ul className="grid gap-2" aria-live="polite">
                {sent.map((s) => ('run' in s
                  ? <SequenceRunView key={s.id} run={s.run} atMs={s.atMs} responseTimeoutMs={link.settings.responseTimeoutMs} />
                  : <ExchangeView key={s.id} x={s.x} atMs={s.atMs} replyTemplate={s.replyTemplate} responseTimeoutMs={link.settings.responseTimeoutMs} />))}
              </ul>
            </div>
          )}
          <ControlLines link={link} rtsDirection={link.settings.interface === 'rs485-2w' && link.settings.rs485Direction === 'rts'} />
          {serialPort.current && (
            <FramingSearch
              commands={library}
              port={serialPort.current}
              settings={link.settings}
              blocked={busy ? 'Wait for what is on the line to finish first.' : null}
              onActive={setSearching}
              pause={() => link.close()}
              resume={async (note) => {
                const l = await start(serialPort.current!);
                if (note) l.note(note);
              }}
            />
          )}
        </>
      )}
      {link && port && (
        <>
          <ExchangeLogView entries={link.exchangeLog} />
          {fieldLog
            ? <SaveEvidence deviceId={fieldLog.deviceId} deviceLabel={label} openedAt={link.openedAt} text={exchangeLog} canLog={fieldLog.canLog} through={THROUGH_TEXT[through]} />
            : <ExchangeLogDownload label={label} openedAt={link.openedAt} text={exchangeLog} />}
        </>
      )}
    </div>
  );
}
