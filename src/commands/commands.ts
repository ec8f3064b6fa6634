/* The ribbon's function file. Leeway's only ribbon command opens the task pane (ShowTaskpane in
 * the manifest), so nothing is registered here beyond Office's start-up handshake. */
Office.onReady(() => undefined);
