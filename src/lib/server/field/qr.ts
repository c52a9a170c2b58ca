/** QR codes rendered on the server as inline SVG (no image route needed; the CSP allows inline SVG). */
import QRCode from 'qrcode';

export async function qrSvg(url: string): Promise<string> {
  const svg = await QRCode.toString(url, { type: 'svg', errorCorrectionLevel: 'M', margin: 1, color: { dark: '#000000', light: '#ffffff' } });
  // Scale with its box; keep the title for screen readers.
  return svg.replace('<svg ', '<svg role="img" aria-label="QR code linking to this card" preserveAspectRatio="xMidYMid meet" ');
}
