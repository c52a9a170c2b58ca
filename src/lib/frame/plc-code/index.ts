/** Structured Text (IEC 61131-3) generated from command templates: pure, runs in browser and server alike. */
export {
  PLC_CAUTION, type PlcCode, type PlcCodeOptions, type PlcForm, type PlcInput, type PlcNote, type PlcStepInput, generatePlcCode, prefixProblem,
} from './generate';
export { IEC_RESERVED_WORDS, identifierProblem, isReservedWord, toIdentifier } from './identifiers';
export { type NumberPlan, planNumber } from './number-plan';
export { type PlcCodeRequest, plcCodeRequestSchema } from './schema';
export { type PlcFileCommand, type PlcFileSequence, type PlcSequenceCode, plcCodeForSequence, plcFileForCommands, plcFileForDevices } from './device-file';
