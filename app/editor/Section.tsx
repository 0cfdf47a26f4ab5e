// A titled, collapsible group of the setup editor.
import type { ReactNode } from 'react';

/** One group of fields, open by default. */
export function Section(props: { title: string; id: string; children: ReactNode }) {
  return (
    <details className="section" open id={'sec-' + props.id}>
      <summary>{props.title}</summary>
      <div className="section-body">{props.children}</div>
    </details>
  );
}
