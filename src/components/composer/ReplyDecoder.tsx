/** Paste a received reply in any notation: decoded fields, the checksum verdict and findings. */
import { useEffect, useMemo, useState } from 'react';
import type { decodeReply as DecodeReply } from '../../lib/frame/decode-reply';
import type { Template } from '../../lib/frame/template';
import { BytesInput, useBytesInput } from './BytesInput';
import { DecodedReply } from './DecodedReply';

let loadedDecoder: typeof DecodeReply | null = null;

/** The reply decoder of the engine, loaded when the first reply is pasted (it is not needed before). */
function useDecodeReply(wanted: boolean): typeof DecodeReply | null {
  const [decode, setDecode] = useState(() => loadedDecoder);
  useEffect(() => {
    if (!wanted || decode) return;
    let live = true;
    import('../../lib/frame/decode-reply').then((m) => {
      loadedDecoder = m.decodeReply;
      if (live) setDecode(() => m.decodeReply);
    });
    return () => {
      live = false;
    };
  }, [wanted, decode]);
  return decode;
}

export function ReplyDecoder({ template }: { template: Template }) {
  const input = useBytesInput();
  const { read } = input;
  const decodeReply = useDecodeReply(!!read?.ok);
  const decoded = useMemo(() => (read?.ok && decodeReply ? decodeReply(template, read.bytes) : null), [read, template, decodeReply]);
  return (
    <div className="grid gap-3">
      <BytesInput input={input} id="reply" label="Received reply" placeholder="e.g. 1=STA:+0004500,R*14$0D" />
      {decoded && (
        <DecodedReply decoded={decoded} template={template} testIds={{ root: 'reply-result', checksum: 'checksum-verdict', fields: 'reply-fields' }} />
      )}
    </div>
  );
}
