import { useEffect } from 'react';

/** Sets the tab title to "<page> · Plinth", so screen-reader users hear where a navigation landed. */
export function useDocumentTitle(title: string | null | undefined): void {
  useEffect(() => {
    document.title = title ? `${title} · Plinth` : 'Plinth';
  }, [title]);
}
