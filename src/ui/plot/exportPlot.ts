/**
 * Saving what is on screen: a plot as a standalone SVG (computed colours and fonts written into the
 * copy, so it looks the same outside the page) or as a PNG drawn from that SVG, and any text or
 * blob as a download. Everything stays in the page: blob: URLs, no server.
 */

const STYLE_PROPERTIES = [
  'fill',
  'fill-opacity',
  'stroke',
  'stroke-width',
  'stroke-opacity',
  'stroke-dasharray',
  'opacity',
  'font-family',
  'font-size',
  'font-weight',
  'text-anchor',
  'dominant-baseline',
  'visibility',
  'display',
  'shape-rendering',
] as const;

/**
 * The plot as SVG text: a copy of the element with each node's computed presentation written in,
 * a background rectangle in the panel colour, the brush overlay removed.
 */
export function svgText(svg: SVGSVGElement): string {
  const copy = svg.cloneNode(true) as SVGSVGElement;
  const originals = [svg, ...svg.querySelectorAll('*')];
  const copies = [copy, ...copy.querySelectorAll('*')];
  originals.forEach((original, i) => {
    const target = copies[i] as SVGElement;
    const style = getComputedStyle(original);
    const inline: string[] = [];
    for (const property of STYLE_PROPERTIES) {
      const value = style.getPropertyValue(property);
      if (value) inline.push(`${property}:${value}`);
    }
    target.setAttribute('style', inline.join(';'));
    target.removeAttribute('class');
  });
  for (const overlay of copy.querySelectorAll('[data-export="omit"]')) overlay.remove();
  const width = svg.clientWidth || Number(svg.getAttribute('width')) || 600;
  const height = svg.clientHeight || Number(svg.getAttribute('height')) || 300;
  copy.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  copy.setAttribute('width', String(width));
  copy.setAttribute('height', String(height));
  copy.setAttribute('viewBox', `0 0 ${width} ${height}`);
  const background = document.createElementNS('http://www.w3.org/2000/svg', 'rect');
  background.setAttribute('width', '100%');
  background.setAttribute('height', '100%');
  background.setAttribute('fill', getComputedStyle(svg.closest('.panel') ?? document.body).backgroundColor || '#ffffff');
  copy.insertBefore(background, copy.firstChild);
  return new XMLSerializer().serializeToString(copy);
}

/** Draw SVG text into a canvas at `scale` × its size and return the PNG. */
export async function pngBlob(svg: SVGSVGElement, scale = 2): Promise<Blob> {
  const text = svgText(svg);
  const width = svg.clientWidth || 600;
  const height = svg.clientHeight || 300;
  const url = URL.createObjectURL(new Blob([text], { type: 'image/svg+xml' }));
  try {
    const image = new Image();
    image.decoding = 'async';
    const loaded = new Promise<void>((resolve, reject) => {
      image.onload = () => resolve();
      image.onerror = () => reject(new Error('the plot could not be drawn as an image'));
    });
    image.src = url;
    await loaded;
    const canvas = document.createElement('canvas');
    canvas.width = Math.round(width * scale);
    canvas.height = Math.round(height * scale);
    const context = canvas.getContext('2d');
    if (!context) throw new Error('no 2D canvas context');
    context.scale(scale, scale);
    context.drawImage(image, 0, 0, width, height);
    return await new Promise<Blob>((resolve, reject) => canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('PNG encoding failed'))), 'image/png'));
  } finally {
    URL.revokeObjectURL(url);
  }
}

/** Offer a blob or text as a file download. */
export function download(fileName: string, content: Blob | string, type = 'text/plain;charset=utf-8'): void {
  const blob = typeof content === 'string' ? new Blob([content], { type }) : content;
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.rel = 'noopener';
  link.style.display = 'none';
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
