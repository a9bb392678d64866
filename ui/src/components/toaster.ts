import { OverlayToaster, type Intent, type Toaster } from '@blueprintjs/core';

let toaster: Promise<Toaster> | null = null;

/** A short confirmation or problem report in the corner; the sentence is the whole message. */
export function notify(message: string, intent: Intent = 'success'): void {
  toaster ??= OverlayToaster.create({ position: 'bottom-right', maxToasts: 3 });
  void toaster.then((t) => t.show({ message, intent, timeout: intent === 'danger' ? 8000 : 3500 }));
}
