/** The live link on a device page (loaded on demand by LiveLinkOpener): the device's ports and command library, evidence to its field log. */
import { useQuery } from '@tanstack/react-query';
import { QueryProvider } from '../QueryProvider';
import { api } from '../../lib/client/api';
import { commandKeys } from '../../lib/client/keys';
import { LinkPanel } from './LinkPanel';
import type { LibraryCommand } from './library';
import type { LiveLinkProps } from './types';

function DevicePanel({ deviceId, deviceLabel, ports, canLog }: LiveLinkProps) {
  const commands = useQuery({ queryKey: commandKeys.list({ kind: 'device', id: deviceId }), queryFn: () => api<{ items: LibraryCommand[] }>(`/api/commands?deviceId=${deviceId}`) });
  return (
    <>
      {commands.isError && <p className="notice notice-bad text-sm" role="alert">The device's commands could not be loaded: {commands.error.message}</p>}
      <LinkPanel label={deviceLabel} ports={ports} commands={commands.data?.items ?? null} commandsNoun="this device's commands" fieldLog={{ deviceId, canLog }} />
    </>
  );
}

export default function LiveLinkPanel(props: LiveLinkProps) {
  return <QueryProvider><DevicePanel {...props} /></QueryProvider>;
}
