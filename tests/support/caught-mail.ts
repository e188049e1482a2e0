// Waiting for a caught e-mail by watching the catcher's folder: the test wakes when a file lands, not on a timer.
import { readdir, readFile, watch } from 'node:fs/promises';
import path from 'node:path';
import { simpleParser } from 'mailparser';

async function find(mailDir: string, to: string, subject: RegExp): Promise<string | null> {
  const files = (await readdir(mailDir)).filter((f) => f.endsWith('.eml')).sort().toReversed();
  for (const f of files) {
    const mail = await simpleParser(await readFile(path.join(mailDir, f)));
    const recipients = [mail.to ?? []].flat().flatMap((a) => a.value.map((v) => v.address));
    if (recipients.includes(to) && subject.test(mail.subject ?? '')) return mail.text ?? '';
  }
  return null;
}

/** The text of the newest caught e-mail to this address whose subject matches, waiting (up to 10 s) for it to arrive. */
export async function latestMail(mailDir: string, to: string, subject: RegExp): Promise<string> {
  const stop = new AbortController();
  const timer = setTimeout(() => stop.abort(), 10_000);
  try {
    // Watch first, then look, so a file landing in between still wakes us.
    const events = watch(mailDir, { signal: stop.signal });
    const found = await find(mailDir, to, subject);
    if (found !== null) return found;
    for await (const e of events) {
      if (!e.filename?.endsWith('.eml')) continue;
      const text = await find(mailDir, to, subject);
      if (text !== null) return text;
    }
  } catch (err) {
    if (!(err instanceof Error && err.name === 'AbortError')) throw err;
  } finally {
    clearTimeout(timer);
    stop.abort();
  }
  throw new Error(`no e-mail to ${to} matching ${subject}`);
}
