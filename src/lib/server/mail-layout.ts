// Plain text and HTML from one description of a message, so the two never drift apart.

export interface MailBlock {
  kind: 'p' | 'button' | 'small';
  text: string;
  href?: string;
}

export function escapeHtml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

export function mailText(greeting: string, blocks: MailBlock[]): string {
  const parts = [greeting, ...blocks.map((b) => (b.kind === 'button' ? `${b.text}:\n${b.href}` : b.text))];
  return `${parts.join('\n\n')}\n\n— Bearline\n`;
}

export function mailHtml(greeting: string, blocks: MailBlock[]): string {
  const body = blocks
    .map((b) => {
      if (b.kind === 'button') {
        const href = escapeHtml(b.href ?? '');
        return `<p style="margin:24px 0"><a href="${href}" style="background:#1f3043;color:#ffffff;padding:12px 20px;border-radius:6px;text-decoration:none;font-weight:bold;display:inline-block">${escapeHtml(b.text)}</a></p>
<p style="font-size:13px;color:#555">If the button does not work, copy this address into your browser:<br><span style="word-break:break-all">${href}</span></p>`;
      }
      const style = b.kind === 'small' ? 'font-size:13px;color:#555' : 'margin:0 0 16px';
      return `<p style="${style}">${escapeHtml(b.text).replace(/\n/g, '<br>')}</p>`;
    })
    .join('\n');
  return `<!doctype html><html lang="en"><body style="font-family:Helvetica,Arial,sans-serif;font-size:15px;line-height:1.5;color:#152231;max-width:560px;margin:0 auto;padding:16px">
<p style="margin:0 0 16px">${escapeHtml(greeting)}</p>
${body}
<p style="margin-top:32px;color:#555">— Bearline</p>
</body></html>`;
}
