import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';

/** Our mark: a round dial face with its needle, drawn here so nothing is fetched. */
export function DialGlyph({ size = 22 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <circle cx="16" cy="16" r="14" fill="#17695C" />
      <circle cx="16" cy="16" r="10.5" fill="none" stroke="#F6F7F5" strokeWidth="1.6" strokeDasharray="2 3.5" />
      <path d="M16 16 L23 9.5" stroke="#F6F7F5" strokeWidth="2.4" strokeLinecap="round" />
      <circle cx="16" cy="16" r="2.4" fill="#F6F7F5" />
    </svg>
  );
}

export function BrandMark({ linked = true }: { linked?: boolean }) {
  const content = (
    <span className="brand-mark">
      <DialGlyph />
      <span className="brand-name">Dialsheet</span>
    </span>
  );
  return linked ? (
    <Link to={paths.campaigns.getHref()} className="brand-link" aria-label="Dialsheet, all campaigns">
      {content}
    </Link>
  ) : (
    content
  );
}
