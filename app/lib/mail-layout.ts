// HTML e-mail frame with inline styles only: mail clients drop <style> blocks and external CSS.
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

export function mailLayout(title: string, bodyHtml: string, footerHtml = ""): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(title)}</title></head>
<body style="margin:0;padding:0;background:#eef3f5;font-family:Arial,Helvetica,sans-serif;color:#0f2530">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:#eef3f5"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" width="600" cellpadding="0" cellspacing="0" style="max-width:600px;width:100%;background:#ffffff;border-radius:8px;border:1px solid #d5e0e5">
<tr><td style="background:#0b4f6c;color:#ffffff;padding:14px 20px;font-size:18px;font-weight:700;border-radius:8px 8px 0 0">Tidewire · Kestrel Sound</td></tr>
<tr><td style="padding:20px;font-size:16px;line-height:1.5">
<h1 style="margin:0 0 16px;font-size:20px;color:#0f2530">${escapeHtml(title)}</h1>
${bodyHtml}
</td></tr>
<tr><td style="padding:14px 20px;border-top:1px solid #d5e0e5;font-size:12px;color:#4a5a66;line-height:1.4">
Tidewire informs; it does not replace official charts, official notices to mariners or a proper lookout.${footerHtml}
</td></tr></table></td></tr></table></body></html>`;
}
