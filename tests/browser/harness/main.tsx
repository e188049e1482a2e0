// A page for the browser tests alone: the scanner on its own, built by the test that uses it.
import '@fontsource/nunito-sans/400.css';
import '@fontsource/nunito-sans/600.css';
import '@fontsource/nunito-sans/700.css';
import '../../../app/styles.css';
import { StrictMode, useState } from 'react';
import { createRoot } from 'react-dom/client';
import { QrScanner } from '../../../app/components/qr-scanner.tsx';
import { Button } from '../../../app/components/ui/button.tsx';

// Every stream the page is given, and what it asked for, so a test can see the camera let go.
const streams: MediaStream[] = [];
const requests: MediaStreamConstraints[] = [];
const original = navigator.mediaDevices?.getUserMedia?.bind(navigator.mediaDevices);
if (original) {
  navigator.mediaDevices.getUserMedia = async (constraints?: MediaStreamConstraints) => {
    requests.push(constraints ?? {});
    const stream = await original(constraints);
    streams.push(stream);
    return stream;
  };
}
Object.assign(window, {
  cameraLog: {
    requests: () => requests,
    opened: () => streams.length,
    liveTracks: () => streams.flatMap((s) => s.getTracks()).filter((t) => t.readyState === 'live').length,
  },
});

function Harness() {
  const [open, setOpen] = useState(false);
  const [results, setResults] = useState<string[]>([]);
  return (
    <main className="mx-auto flex max-w-2xl flex-col gap-4 p-6">
      <h1 className="text-3xl font-bold text-ink-900">Scanner check</h1>
      {open ? <QrScanner label="Scan a label" onResult={(text) => setResults((r) => [...r, text])} /> : null}
      <div>
        <Button variant="secondary" onClick={() => setOpen((o) => !o)}>
          {open ? 'Close the scanner' : 'Open the scanner'}
        </Button>
      </div>
      <p data-testid="results">{JSON.stringify(results)}</p>
    </main>
  );
}

const root = document.getElementById('root');
if (!root) throw new Error('index.html must contain <div id="root">');
createRoot(root).render(
  <StrictMode>
    <Harness />
  </StrictMode>,
);
