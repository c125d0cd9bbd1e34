/**
 * The application menu, our own: the five screens with shortcuts, the bench actions, view and help.
 * Built as plain data (a template) so it is tested without Electron; main.ts hands it to Menu.buildFromTemplate.
 */
export type ScreenName = 'board' | 'bench' | 'transfer' | 'trim' | 'logbook';

export interface MenuActions {
  showScreen(screen: ScreenName): void;
  toggleHold(): void;
  keepCapture(): void;
  showSafetyNote(): void;
  openDataFolder(): void;
  quit(): void;
}

export interface MenuItemTemplate {
  label?: string;
  role?: 'reload' | 'forceReload' | 'toggleDevTools' | 'resetZoom' | 'zoomIn' | 'zoomOut' | 'togglefullscreen' | 'copy' | 'paste' | 'cut' | 'selectAll' | 'undo' | 'redo' | 'minimize' | 'close' | 'about';
  type?: 'separator';
  accelerator?: string;
  click?: () => void;
  submenu?: MenuItemTemplate[];
}

const screens: Array<{ screen: ScreenName; label: string }> = [
  { screen: 'board', label: 'Board' },
  { screen: 'bench', label: 'Bench' },
  { screen: 'transfer', label: 'Transfer' },
  { screen: 'trim', label: 'Trim' },
  { screen: 'logbook', label: 'Logbook' },
];

export function buildMenuTemplate(actions: MenuActions, options: { developer: boolean }): MenuItemTemplate[] {
  const view: MenuItemTemplate[] = [{ role: 'resetZoom' }, { role: 'zoomIn' }, { role: 'zoomOut' }, { type: 'separator' }, { role: 'togglefullscreen' }];
  if (options.developer) view.push({ type: 'separator' }, { role: 'reload' }, { role: 'toggleDevTools' });
  return [
    {
      label: 'Rampwright',
      submenu: [
        { label: 'Open Data Folder', click: () => actions.openDataFolder() },
        { type: 'separator' },
        { label: 'Quit', accelerator: 'CmdOrCtrl+Q', click: () => actions.quit() },
      ],
    },
    { label: 'Edit', submenu: [{ role: 'undo' }, { role: 'redo' }, { type: 'separator' }, { role: 'cut' }, { role: 'copy' }, { role: 'paste' }, { role: 'selectAll' }] },
    {
      label: 'Screens',
      submenu: screens.map(({ screen, label }, index) => ({ label, accelerator: `CmdOrCtrl+${index + 1}`, click: () => actions.showScreen(screen) })),
    },
    {
      label: 'Bench',
      submenu: [
        { label: 'Hold / Release Plot', accelerator: 'CmdOrCtrl+H', click: () => actions.toggleHold() },
        { label: 'Keep Capture', accelerator: 'CmdOrCtrl+K', click: () => actions.keepCapture() },
      ],
    },
    { label: 'View', submenu: view },
    { label: 'Help', submenu: [{ label: 'Safety When Measuring', click: () => actions.showSafetyNote() }, { role: 'about' }] },
  ];
}
