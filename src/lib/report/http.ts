/** File answers of the review and report endpoints: CSV tables, PDF and HTML exports. */
const safeName = (name: string) => name.toLowerCase().normalize('NFKD').replace(/[^a-z0-9.]+/g, '-').replace(/^-|-$/g, '').slice(0, 80) || 'export';

function download(body: BodyInit, contentType: string, filename: string, inline = false, extra: Record<string, string> = {}): Response {
  return new Response(body, {
    headers: {
      ...extra,
      'content-type': contentType,
      'content-disposition': `${inline ? 'inline' : 'attachment'}; filename="${safeName(filename)}"`,
      'cache-control': 'no-store',
      'x-content-type-options': 'nosniff',
    },
  });
}

/** CSV with a byte-order mark, so spreadsheet programs read it as UTF-8. */
export function csvResponse(csv: string, name: string): Response {
  return download(`\uFEFF${csv}`, 'text/csv; charset=utf-8', `${name}.csv`);
}

export function pdfResponse(pdf: Buffer, filename: string, inline: boolean): Response {
  return download(new Uint8Array(pdf), 'application/pdf', filename, inline);
}

/** The export is self-contained: no scripts, nothing fetched, should someone open it from here. */
export function htmlResponse(html: string, filename: string): Response {
  return download(html, 'text/html; charset=utf-8', filename, false, {
    'content-security-policy': "default-src 'none'; style-src 'unsafe-inline'; font-src data:; img-src data:",
  });
}
