/** One call for a composer preview: assemble, render every notation, and run the frame checks. */
import { type AssembledFrame, assembleFrame } from './assemble';
import { checkFrame } from './check-frame';
import { checkChecksumProtocol } from './checksum-protocol';
import { type Finding, isClean } from './findings';
import type { FrameRulesInput } from './frame-rules';
import { type RenderedNotations, renderAllNotations } from './notations';
import type { PROTOCOLS } from './port-settings';
import type { FieldValues, Template } from './template';

export interface FramePreview extends AssembledFrame {
  notations: RenderedNotations;
}

/**
 * Field findings from assembly followed by frame findings. Rules come from `settings.frameRules`
 * unless given; `settings.dataBits` enables the data-bits check; `settings.protocol` the checks of the
 * checksum settings for Modbus RTU and Modbus ASCII.
 */
export function previewFrame(
  template: Template,
  values: FieldValues,
  settings?: { dataBits: number; frameRules?: FrameRulesInput; protocol?: (typeof PROTOCOLS)[number] },
  rules?: FrameRulesInput,
): FramePreview {
  const frame = assembleFrame(template, values);
  const frameFindings = checkFrame(frame.bytes, frame.segments, rules ?? settings?.frameRules ?? {}, settings);
  if (settings?.protocol) frameFindings.push(...checkChecksumProtocol(template, frame.segments, settings.protocol));
  const findings: Finding[] = frameFindings.length ? frame.findings.concat(frameFindings) : frame.findings;
  return { ...frame, ok: isClean(findings), findings, notations: renderAllNotations(frame.bytes) };
}
