/** Browser downloads: a Blob saved under a file name, and an SVG drawn onto a canvas as PNG. */
export function downloadBlob(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = filename;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1_000);
}

/** Browsers cap canvas sides near 16k pixels; larger trees are scaled down to fit. */
const MAX_SIDE = 16_000;

export async function svgToPng(svg: string, scale = 2): Promise<Blob> {
  const url = URL.createObjectURL(new Blob([svg], { type: 'image/svg+xml' }));
  try {
    const image = new Image();
    image.src = url;
    await image.decode();
    const factor = Math.min(scale, MAX_SIDE / image.width, MAX_SIDE / image.height);
    const canvas = document.createElement('canvas');
    canvas.width = Math.max(1, Math.floor(image.width * factor));
    canvas.height = Math.max(1, Math.floor(image.height * factor));
    const context = canvas.getContext('2d');
    if (!context) throw new Error('This browser cannot draw the PNG');
    context.drawImage(image, 0, 0, canvas.width, canvas.height);
    return await new Promise<Blob>((done, fail) => canvas.toBlob((b) => (b ? done(b) : fail(new Error('The PNG could not be made'))), 'image/png'));
  } finally {
    URL.revokeObjectURL(url);
  }
}
