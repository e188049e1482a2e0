import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { labelCodeFromUrl, parseLabelCode } from '#shared/domain/label-codes.ts';
import { QrScanner } from '../../../components/qr-scanner.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { plinthPathFromCode } from '../../../lib/scanned-code.ts';
import { paths } from '../../../lib/paths.ts';

/**
 * "Scan a label": the tablet's camera reads a cast's or a shelf's QR (or the code printed under
 * it is typed) and the record opens. Only labels of this Plinth are followed.
 */
export function LabelScanner() {
  const navigate = useNavigate();
  const [open, setOpen] = useState(false);
  const [attempt, setAttempt] = useState(0);
  const [problem, setProblem] = useState<string | null>(null);

  function onResult(text: string) {
    const origin = window.location.origin;
    const fromUrl = labelCodeFromUrl(text, origin);
    const read = fromUrl ?? (/^https?:\/\/|^\//i.test(text.trim()) ? null : parseLabelCode(text));
    if (read?.ok) return navigate(paths.label.href(read.code));
    const path = read ? null : plinthPathFromCode(text, origin);
    if (path) return navigate(path);
    setProblem(read && !read.ok ? read.message : 'This code is not a Plinth label. Scan the label on the cast or shelf, or type the code printed under it.');
    // A fresh scanner, so the next label can be read.
    setAttempt((n) => n + 1);
  }

  return (
    <div className="flex flex-col gap-3">
      <div>
        <Button variant={open ? 'secondary' : 'primary'} aria-expanded={open} onClick={() => { setOpen((o) => !o); setProblem(null); }} data-testid="scan-label">
          {open ? 'Close the scanner' : 'Scan a label'}
        </Button>
      </div>
      {problem ? <ErrorBanner title="That label did not open anything" message={problem} /> : null}
      {open ? <QrScanner key={attempt} onResult={onResult} label="Scan a label" manualLabel="Or type the label code" manualHint="Printed under the QR, for example C-7K3Q9G." /> : null}
    </div>
  );
}
