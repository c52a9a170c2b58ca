/** Props of the live link island, kept apart so the opener loads without the panel. */
import type { PortSettings } from '../../lib/frame/port-settings';

export interface LiveLinkProps {
  deviceId: string;
  /** `DRV-501 Seamer drive` */
  deviceLabel: string;
  ports: { name: string; settings: PortSettings }[];
  /** Technicians and above: save the exchange log to the field log. */
  canLog: boolean;
}
