// The notice bar: problems with a link or a loaded file, one line per issue, dismissable.
import { setNotice, useApp } from './store.ts';

/** Shows the current notice, if any. */
export function NoticeBar() {
  const n = useApp((s) => s.notice);
  if (!n) return null;
  return (
    <div className={'notice ' + n.kind} id="notice" role={n.kind === 'error' ? 'alert' : 'status'}>
      <div className="notice-text">
        <strong>{n.title}</strong>
        {n.lines.length ? (
          <ul>
            {n.lines.map((l, i) => (
              <li key={i}>{l}</li>
            ))}
          </ul>
        ) : null}
      </div>
      <button type="button" className="small" onClick={() => setNotice(null)} aria-label="Dismiss the notice">
        ✕
      </button>
    </div>
  );
}
