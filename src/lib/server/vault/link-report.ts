/**
 * Adapter from vault links to the frame engine's `checkLink`: builds its members from stored
 * ports, and adds two findings the engine has no code for (too few members, members in the trash).
 */
import { checkLink, type LinkCode, type LinkFinding, type LinkMember } from '../../frame/link-check';
import { overallState } from '../../frame/findings';
import type { MemberView } from './link-members';

export type VaultLinkCode = LinkCode | 'too-few-members' | 'member-in-trash';

export interface VaultFinding extends Omit<LinkFinding, 'code'> {
  code: VaultLinkCode;
  /** "DRV-201 RS-485" — the end to change, when the finding names one. */
  memberLabel?: string;
}

export interface VaultLinkReport {
  state: 'ok' | 'warning' | 'error';
  findings: VaultFinding[];
}

export function memberLabel(m: Pick<MemberView, 'deviceTag' | 'portName'>): string {
  return `${m.deviceTag} ${m.portName}`;
}

export function reportFor(link: { kind: 'point-to-point' | 'rs485-bus'; cableLengthM: number | null }, members: MemberView[]): VaultLinkReport {
  const live = members.filter((m) => !m.inTrash);
  const labels = new Map(live.map((m) => [m.portId, memberLabel(m)]));
  const asMember = (m: MemberView): LinkMember => ({
    id: m.portId,
    label: memberLabel(m),
    role: m.role,
    settings: m.settings,
    ...(m.unitLoads != null ? { unitLoads: m.unitLoads } : {}),
    ...(m.isEnd != null ? { isEnd: m.isEnd } : {}),
  });
  const report = checkLink(
    live.map((m) => {
      if (!m.bridge) return asMember(m);
      const b = m.bridge;
      for (const x of b.beyond) if (!labels.has(x.portId)) labels.set(x.portId, `${memberLabel(x)} (through ${b.deviceTag})`);
      const other = { id: b.other.portId, label: `${b.deviceTag} ${b.other.portName}`, role: m.role, settings: b.other.settings };
      return { ...asMember(m), bridge: { via: b.deviceTag, other, beyond: b.beyond.map(asMember) } };
    }),
    { kind: link.kind, ...(link.cableLengthM != null ? { cableLengthM: link.cableLengthM } : {}) },
  );
  const findings: VaultFinding[] = report.findings.map((f) => {
    const label = f.memberId ? labels.get(f.memberId) : undefined;
    return label ? { ...f, memberLabel: label } : { ...f };
  });
  for (const m of members.filter((x) => x.inTrash)) {
    findings.push({ severity: 'warning', code: 'member-in-trash', memberId: m.portId, memberLabel: memberLabel(m), message: `${memberLabel(m)} is in the trash; restore it or remove it from this link.` });
  }
  if (live.length < 2) {
    findings.push({ severity: 'warning', code: 'too-few-members', message: `This link has ${live.length === 0 ? 'no ports' : 'one port'}; add the port at the other end so both ends can be checked.` });
  }
  return { state: overallState(findings), findings };
}
