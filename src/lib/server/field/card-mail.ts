/** E-mails one device's card as text, with a link to the card for colleagues who have an account. */
import type { TeamContext } from '../guard';
import { sendMail } from '../mail';
import { CAUTION } from '../../field/card';
import { config } from '../../../config';
import { deviceCard } from './cards';

export async function emailCard(ctx: TeamContext, deviceId: string, to: string, message: string): Promise<{ sent: true; to: string }> {
  const card = await deviceCard(ctx, deviceId);
  const title = card.device.name ? `${card.device.tag} ${card.device.name}` : card.device.tag;
  const url = `${config.baseUrl}/field/devices/${card.device.id}`;
  const body = [
    `${ctx.user.name} (${ctx.team.name}) sent you the field card of ${title} — ${card.machine.name}, ${card.site.name}.`,
    ...(message ? ['', message] : []),
    '',
    `Card revision ${card.revision.number}${card.revision.date ? ` (${card.revision.date.toISOString().slice(0, 10)})` : ''}`,
    '',
    ...card.ports.flatMap((p) => [p.copyText, '']),
    ...(card.commands.length ? ['Key commands:', ...card.commands.flatMap((c) => c.sends.map((v) =>
      `  ${c.name}${v.preset ? ` (${v.preset})` : ''}: ${v.problem ? `cannot be built: ${v.problem}` : `${v.plc}   [${v.hex}]`}`)), ''] : []),
    CAUTION,
    '',
    `Open the card (team members): ${url}`,
    '',
    '— Baudbook',
  ].join('\n');
  await sendMail({ to, subject: `Field card: ${title}`, text: body });
  return { sent: true, to };
}
