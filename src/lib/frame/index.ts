/** Public API of the frame engine: pure functions over Uint8Array, safe in the browser and on the server. */
export type { ParseError, Result } from './result';
export { toHex, bytesToLatin1, latin1Bytes } from './bytes';

export {
  NOTATIONS, type Notation, type RenderedNotations, parseNotation, renderNotation, renderAllNotations,
  parseEscaped, renderEscaped, parseIec, renderIec, renderIecLiteral, parseMnemonic, renderMnemonic,
  parseHex, renderHex, parseDecimal, renderDecimal,
} from './notations';
export { CONTROL_NAMES } from './notations/mnemonic';
export { type RegisterWords, type WordByteOrder, packRegisterWords, unpackRegisterWords, parseRegisterWords } from './notations/register-words';

export {
  type ChecksumAlgorithm, type ChecksumKind, type ChecksumValue, type ChecksumEncoding, type ChecksumPlacement, type ByteOrder,
  type ChecksumInput, type CrcModel, type CrcParams, type CrcParamsInput, type CrcParamsText, CHECKSUM_ALGORITHMS, CRC_MODELS,
  CUSTOM_CRC, createCrc, crcParamsSchema, isCustomCrcName, customCrcAlgorithm, findChecksumAlgorithm, listChecksumAlgorithms, resolveChecksum,
  defaultChecksumByteOrder, checksumOfRange, computeChecksum, formatChecksumValue, checksumLength, placeChecksum, nmeaChecksum,
  lrc8, xor8, sum8, sum16,
} from './checksum';

export {
  TEMPLATE_VERSION, templateSchema, segmentSchema, scaleSchema, literalSegmentSchema, terminatorSegmentSchema,
  integerFieldSchema, decimalFieldSchema, textFieldSchema, choiceFieldSchema, checksumSegmentSchema,
  type Template, type TemplateInput, type Segment, type SegmentType, type FieldSegment, type IntegerField, type DecimalField,
  type TextField, type ChoiceField, type ChecksumSegment, type Scale, type FieldValues,
  isField, loadTemplate, serializeTemplate, moveSegment,
} from './template';
export { hexBytesSchema, fieldValuesSchema } from './schema-common';
export { MAX_NUMBER_CHARS, type NumberReading, readTypedNumber, roundHalfAway, scaleToRaw, rawToEngineering } from './field-format';

export { type AssembledFrame, type SegmentSpan, assembleFrame } from './assemble';
export { checkFrame } from './check-frame';
export { checkChecksumProtocol } from './checksum-protocol';
export { type FramePreview, type FrameCheckSettings, checkAssembledFrame, previewFrame } from './preview';
export { FINDING_CODES, type Finding, type FindingCode, type Severity, isClean, overallState } from './findings';
export { BYTE_SETS, type ByteSet, frameRulesSchema, type FrameRules, type FrameRulesInput, defaultFrameRules } from './frame-rules';

export {
  INTERFACES, PARITIES, HANDSHAKES, PROTOCOLS, RS485_DIRECTIONS, RTS_MODES, CTS_MODES, DTR_MODES, MAX_RTS_DELAY_MS, STANDARD_BAUD_RATES,
  type PortInterface, type Parity, type StopBits, type Handshake, type Protocol, type Rs485Direction, type RtsMode, type CtsMode, type DtrMode,
  lineSettingsSchema, type LineSettings, portSettingsSchema, portSettingsObjectSchema, withControlLines, fillControlLines,
  linesFromOldKeys, oldKeysFromLines, controlLineDisagreements, alignControlLines, type PortSettings, type PortSettingsInput, defaultPortSettings,
} from './port-settings';
export {
  PARITY_LETTERS, INTERFACE_LABELS, PARITY_LABELS, HANDSHAKE_LABELS, PROTOCOL_LABELS, RS485_DIRECTION_LABELS,
  RTS_MODE_LABELS, CTS_MODE_LABELS, DTR_MODE_LABELS, CONTROL_LINE_LABELS, controlLineFacts,
  SHORTHAND_PIECES, type ShorthandPiece, type ShorthandSettings, type WiringRow,
  lineShorthand, portShorthand, portSettingsText, frameRulesText, portSettingsBlock,
} from './port-text';

export {
  MODBUS_FIXED_TIMING_ABOVE_BAUD, bitsPerChar, charTimeMs, silentIntervals, lineTiming, roundMs, timingReport, pollCycle, bitSequence,
  type LineTiming, type TimingReport, type PolledDevice, type BitCell, type BitKind, type BitSequence,
} from './timing';

export { LINK_CODES, MAX_UNIT_LOADS, LENGTH_RATE_LIMIT, type Link, type LinkMember, type LinkBridge, type LinkFinding, type LinkCode, type LinkReport, checkLink } from './link-check';
export { type DecodedReply, type DecodedField, type ChecksumVerdict, decodeReply } from './decode-reply';
export { type LongestFrame, type UnlimitedField, longestFrame } from './longest';
export {
  SEQUENCE_MODES, MAX_SEQUENCE_STEPS, type SequenceMode, type SequenceStepInput, type SequenceOptions, type SequenceFinding,
  type SequenceStep, type SequenceTiming, type PlcStringLength, type AssembledSequence, assembleSequence, plcStringFit,
} from './sequence';
export { MAX_SEQUENCE_DELAY_MS, MAX_PLC_STRING_CAPACITY, sequenceStepSchema, sequenceSchema, type SequenceRequest } from './sequence-schema';
export {
  BUS_CYCLE_CODES, BROADCAST_TURNAROUND_TYPICAL_MS, type BusPoll, type BusCycleOptions, type PollTiming, type BusCycleCode, type BusCycleFinding,
  type BusCycle, type PollReport, type BusCycleReport, pollTiming, busCycle, busCycleReport,
} from './bus-cycle';
export {
  MAX_DROP_M, MULTI_PORT_TAP_M, BUS_TOPOLOGIES, BUS_LAYOUT_CODES, type BusTopology, type BusLayoutMember, type BusLayout, type BusLayoutCode,
  type BusLayoutFinding, maxDropM, checkBusLayout,
} from './bus-layout';
export { MAX_BUS_POLLS, MAX_POLL_BYTES, MAX_POLL_MS, busPollSchema, busLayoutMemberSchema, busCycleSchema, type BusCycleRequest } from './bus-cycle-schema';
export { type StepReply, type SequenceReply, decodeSequenceReply } from './sequence-reply';
