/**
 * Runs in the page before any of its scripts (bundled by `fakeSerialScript`): gives the page a fake Web Serial
 * (`navigator.serial`) whose far end is the simulated demo drive, as a fake SMTP server stands in for mail.
 * The simulator's settings come from `window.__liveLinkSim`, set by an init script before this one; what was
 * opened and written stays in `window.__fakeSerial.evidence` for the test to read.
 */
import './zod-jitless';
import { createFakeSerial } from '../../../src/lib/live/fake-serial';
import type { SimulatorSettings } from '../../../src/lib/live/simulator';
import { indexAckTemplate, indexMoveTemplate, jogTemplate, lineAckTemplate, lineSetupTemplate, statusQueryTemplate, statusReplyTemplate } from '../../../src/lib/composer/demo';

const w = window as unknown as { __liveLinkSim?: Partial<SimulatorSettings>; __fakeSerial?: unknown };
const fake = createFakeSerial({
  line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 },
  commands: [
    { id: 'cmd_demo_drv501_index', name: 'Index 45°', template: indexMoveTemplate, replyTemplate: indexAckTemplate },
    { id: 'cmd_demo_drv501_jog_fwd', name: 'Jog +1°', template: jogTemplate('+'), replyTemplate: null },
    { id: 'cmd_demo_drv501_jog_rev', name: 'Jog −1°', template: jogTemplate('-'), replyTemplate: null },
    { id: 'cmd_demo_drv501_status', name: 'Status query', template: statusQueryTemplate, replyTemplate: statusReplyTemplate },
    // Marked as a setup command in the demo: after answering, the simulated drive takes on the line settings it was sent.
    { id: 'cmd_demo_drv501_line', name: 'Set service line', template: lineSetupTemplate, replyTemplate: lineAckTemplate, setsUpDevice: true },
  ],
  responseDelayMs: 5,
  replyValues: { cmd_demo_drv501_status: { position: 45, state: 'ready' } },
  ...w.__liveLinkSim,
});
Object.defineProperty(navigator, 'serial', { value: fake, configurable: true });
w.__fakeSerial = fake;
