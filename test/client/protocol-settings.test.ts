// The protocol's settings message carries every scale the panel accepts, 'auto' included, so the host
// and the panel share one type (checked by `npm run typecheck`, which covers this file, and at run time
// by the panel's message check).
import { describe, expect, it } from 'vitest';
import type { PanelSettingsMessage } from '../../server/src/protocol';
import { parseHostMessage } from '../../client/src/messages';

describe('PanelSettingsMessage', () => {
  it("types 'auto' as a plot scale, and the panel accepts each one the type allows", () => {
    const scales: PanelSettingsMessage['plotScale'][] = ['linear', 'log', 'auto'];
    for (const plotScale of scales) {
      const m: PanelSettingsMessage = { type: 'settings', plotScale };
      expect(parseHostMessage(m)).toEqual(m);
    }
    expect(parseHostMessage({ type: 'settings', plotScale: 'cubic' })).toBeNull();
  });
});
