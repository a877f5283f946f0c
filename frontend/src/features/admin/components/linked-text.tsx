import { Fragment } from 'react';

const URL_PATTERN = /\bhttps?:\/\/[^\s<>"')\]]+/g;

/** Splits plain text into text and link parts; trailing punctuation stays outside the link. */
export function splitLinks(text: string): Array<{ kind: 'text' | 'link'; value: string }> {
  const parts: Array<{ kind: 'text' | 'link'; value: string }> = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    let url = match[0];
    const trailing = /[.,;:!?]+$/.exec(url)?.[0] ?? '';
    url = url.slice(0, url.length - trailing.length);
    const start = match.index ?? 0;
    if (start > last) parts.push({ kind: 'text', value: text.slice(last, start) });
    parts.push({ kind: 'link', value: url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ kind: 'text', value: text.slice(last) });
  return parts;
}

function isSameOrigin(url: string): boolean {
  try {
    return new URL(url).origin === window.location.origin;
  } catch {
    return false;
  }
}

/**
 * Shows a message's plain text with its web addresses clickable. The HTML part is never rendered,
 * so a captured message cannot run anything in the app.
 */
export function LinkedText({ text }: { text: string }) {
  return (
    <pre className="mail-text">
      {splitLinks(text).map((part, index) =>
        part.kind === 'link' ? (
          <a
            key={index}
            href={part.value}
            {...(isSameOrigin(part.value) ? {} : { target: '_blank', rel: 'noopener noreferrer' })}
          >
            {part.value}
          </a>
        ) : (
          <Fragment key={index}>{part.value}</Fragment>
        ),
      )}
    </pre>
  );
}
