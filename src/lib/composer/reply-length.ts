/** Expected reply size for timing: the reply template assembled with its defaults (fields without one send nothing). */
import { assembleFrame } from '../frame/assemble';
import { isField, type Template } from '../frame/template';

export function decodeReplyLength(reply: Template): number {
  const values: Record<string, string | number> = {};
  for (const s of reply.segments) {
    if (!isField(s) || s.default !== undefined) continue;
    if (s.type === 'choice') values[s.name] = s.options[0]!.value;
    else if (s.type === 'text') values[s.name] = ''.padEnd(s.maxLength ?? 0, 'X');
    else values[s.name] = 0;
  }
  return assembleFrame(reply, values).byteCount;
}
