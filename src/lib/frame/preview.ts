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

/** The port settings the frame checks read; a parsed `PortSettings` is one. */
export interface FrameCheckSettings {
  dataBits: number;
  frameRules?: FrameRulesInput;
  protocol?: (typeof PROTOCOLS)[number];
}

/**
 * Field findings from assembly followed by frame findings. Rules come from `settings.frameRules`
 * unless given; `settings.dataBits` enables the data-bits check; `settings.protocol` the checks of the
 * checksum settings for Modbus RTU and Modbus ASCII.
 */
export function checkAssembledFrame(template: Template, frame: AssembledFrame, settings?: FrameCheckSettings, rules?: FrameRulesInput): Finding[] {
  const frameFindings = checkFrame(frame.bytes, frame.segments, rules ?? settings?.frameRules ?? {}, settings);
  if (settings?.protocol) frameFindings.push(...checkChecksumProtocol(template, frame.segments, settings.protocol));
  return frameFindings.length ? frame.findings.concat(frameFindings) : frame.findings;
}

/** Assembles, checks (as `checkAssembledFrame`) and renders every notation. */
export function previewFrame(template: Template, values: FieldValues, settings?: FrameCheckSettings, rules?: FrameRulesInput): FramePreview {
  const frame = assembleFrame(template, values);
  const findings = checkAssembledFrame(template, frame, settings, rules);
  return { ...frame, ok: isClean(findings), findings, notations: renderAllNotations(frame.bytes) };
}
