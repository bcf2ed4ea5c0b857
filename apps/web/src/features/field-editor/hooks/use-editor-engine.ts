import { useEffect, useState, useSyncExternalStore } from 'react';
import { saveInspection, type InspectionPage } from '../api';
import { AutosaveEngine } from '../model/autosave';

/** One autosave engine per open inspection, saving on a timer, on leaving and when back online. */
export function useEditorEngine(orderId: string, page: InspectionPage) {
  const [engine] = useState(
    () => new AutosaveEngine({ orderId, initial: page.inspection, canEdit: page.allowed.edit, save: saveInspection }),
  );
  useEffect(() => {
    engine.start();
    const onOnline = () => engine.online();
    const onHide = () => {
      if (document.visibilityState === 'hidden') engine.flush();
    };
    window.addEventListener('online', onOnline);
    window.addEventListener('pagehide', engine.flush);
    document.addEventListener('visibilitychange', onHide);
    return () => {
      window.removeEventListener('online', onOnline);
      window.removeEventListener('pagehide', engine.flush);
      document.removeEventListener('visibilitychange', onHide);
      // Leaving the editor: send what is waiting now rather than after the pause.
      engine.flush();
      engine.stop();
    };
  }, [engine]);
  const snapshot = useSyncExternalStore(engine.subscribe, engine.getSnapshot);
  return { engine, snapshot };
}
