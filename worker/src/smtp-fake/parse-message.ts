/**
 * Just enough MIME reading for the development mailbox page: the Subject and Message-ID
 * headers (RFC 2047 encoded words decoded) and the text body of a single-part message
 * (quoted-printable or base64 decoded). Anything else is shown raw.
 */
export interface ParsedMessage {
  subject: string | null;
  messageId: string | null;
  text: string | null;
}

function decodeWords(value: string): string {
  return value.replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=\s*/g, (_m, _charset: string, enc: string, data: string) => {
    if (enc.toUpperCase() === 'B') return Buffer.from(data, 'base64').toString('utf8');
    const bytes = data.replace(/_/g, ' ').replace(/=([0-9A-Fa-f]{2})/g, (_x, h: string) => String.fromCharCode(parseInt(h, 16)));
    return Buffer.from(bytes, 'latin1').toString('utf8');
  });
}

function decodeQuotedPrintable(body: string): string {
  const bytes = body.replace(/=\r?\n/g, '').replace(/=([0-9A-Fa-f]{2})/g, (_x, h: string) => String.fromCharCode(parseInt(h, 16)));
  return Buffer.from(bytes, 'latin1').toString('utf8');
}

export function parseMessage(raw: string): ParsedMessage {
  const split = raw.search(/\r?\n\r?\n/);
  const head = split < 0 ? raw : raw.slice(0, split);
  const body = split < 0 ? '' : raw.slice(split).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':');
    if (i > 0) headers.set(line.slice(0, i).trim().toLowerCase(), line.slice(i + 1).trim());
  }
  const type = headers.get('content-type') ?? 'text/plain';
  const encoding = (headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  let text: string | null = null;
  if (/^text\/plain/i.test(type)) {
    text = encoding === 'quoted-printable' ? decodeQuotedPrintable(body) : encoding === 'base64' ? Buffer.from(body, 'base64').toString('utf8') : body;
    text = text.replace(/\r\n/g, '\n').replace(/\n$/, '');
  }
  const subject = headers.get('subject');
  return { subject: subject === undefined ? null : decodeWords(subject), messageId: headers.get('message-id') ?? null, text };
}
