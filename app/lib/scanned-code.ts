import { safeReturnTo } from './paths.ts';

/**
 * The page a scanned code opens, when the code is a link into this Plinth (full address on this
 * origin, or a path); null for anything else. A code from elsewhere is never followed: a sticker
 * pasted over a label could otherwise send the tablet to a look-alike sign-in page.
 */
export function plinthPathFromCode(text: string, origin: string): string | null {
  const value = text.trim();
  // A typed label code ("R3-S2") is not a relative link.
  if (!value.startsWith('/') && !/^https?:\/\//i.test(value)) return null;
  let url: URL;
  let home: URL;
  try {
    url = new URL(value, origin);
    home = new URL(origin);
  } catch {
    return null;
  }
  if (url.origin !== home.origin || url.pathname.startsWith('/api/')) return null;
  const path = `${url.pathname}${url.search}${url.hash}`;
  return safeReturnTo(path) === path ? path : null;
}

export type CameraProblem = 'denied' | 'no-camera' | 'busy' | 'unsupported' | 'reader' | 'failed';

/** Why the camera did not open, from the error getUserMedia rejected with. */
export function cameraProblem(error: unknown): CameraProblem {
  const name = typeof error === 'object' && error !== null && 'name' in error ? String(error.name) : '';
  switch (name) {
    case 'NotAllowedError':
    case 'SecurityError':
      return 'denied';
    case 'NotFoundError':
    case 'OverconstrainedError':
      return 'no-camera';
    case 'NotReadableError':
    case 'AbortError':
      return 'busy';
    default:
      return 'failed';
  }
}

/** What the person reads for each camera problem; every one points to typing the code instead. */
export const CAMERA_PROBLEM_MESSAGES: Record<CameraProblem, string> = {
  denied: 'Plinth is not allowed to use the camera. Allow the camera for this site in the browser’s settings and try again, or type the code below.',
  'no-camera': 'No camera was found on this device. Type the code below instead.',
  busy: 'The camera is in use by another app or could not start. Close the other app and try again, or type the code below.',
  unsupported: 'This browser cannot open the camera on this page. Type the code below instead.',
  reader: 'The code reader could not be loaded. Check the connection and try again, or type the code below.',
  failed: 'The camera could not be started. Try again, or type the code below.',
};
