import { useEffect } from 'react';
import { env } from '@/config/env';

/** Names the browser tab after the page, so several open tabs stay tellable apart. */
export function useDocumentTitle(title: string | undefined): void {
  useEffect(() => {
    document.title = title ? `${title} · ${env.appName}` : env.appName;
  }, [title]);
}
