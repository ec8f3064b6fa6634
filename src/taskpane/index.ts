/* Task pane entry (the task pane work builds the UI here). */
import { CAUTION } from '../engine/caution';

Office.onReady(() => {
  const app = document.getElementById('app');
  if (app) app.textContent = CAUTION;
});
