/** The edit form island for a site, machine, device, link or profile page. */
import { QueryProvider } from '../QueryProvider';
import { EntityForm } from './EntityForm';
import { deviceFieldDefs, linkFieldDefs, machineFieldDefs, profileFieldDefs, siteFieldDefs } from './field-defs';
import { deviceFormSchema, linkFormSchema, machineFormSchema, profileFormSchema, siteFormSchema } from '../../lib/schemas/vault';

const KINDS = {
  site: { fields: siteFieldDefs, schema: siteFormSchema, api: 'sites' },
  machine: { fields: machineFieldDefs, schema: machineFormSchema, api: 'machines' },
  device: { fields: deviceFieldDefs, schema: deviceFormSchema, api: 'devices' },
  link: { fields: linkFieldDefs, schema: linkFormSchema, api: 'links' },
  profile: { fields: profileFieldDefs, schema: profileFormSchema, api: 'profiles' },
} as const;

interface Props {
  kind: keyof typeof KINDS;
  record: Record<string, unknown> & { id: string; version: number };
  canEdit: boolean;
  afterDelete?: string;
  /** Reload the page after a save (when the server-rendered parts show saved values, e.g. a link's findings). */
  reloadOnSave?: boolean;
}

export default function RecordEditor({ kind, record, canEdit, afterDelete, reloadOnSave }: Props) {
  const k = KINDS[kind];
  return (
    <QueryProvider>
      <EntityForm
        noun={kind}
        path={`/api/${k.api}/${record.id}`}
        record={record}
        fields={k.fields}
        schema={k.schema}
        canEdit={canEdit}
        afterDelete={afterDelete}
        onSaved={reloadOnSave ? () => location.reload() : undefined}
      />
    </QueryProvider>
  );
}
