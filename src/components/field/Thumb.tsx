/**
 * A photo thumbnail: the stored image scaled by the browser to a fixed box (no image library on the
 * server), linking to the full-size file.
 */
export function Thumb({ url, name, size = 96 }: { url: string; name: string; size?: number }) {
  return (
    <a href={url} target="_blank" rel="noopener" className="block rounded border border-line overflow-hidden bg-paper" title={name}>
      <img src={url} alt={name} width={size} height={size} loading="lazy" className="object-cover" style={{ width: size, height: size }} data-testid="thumb" />
    </a>
  );
}
