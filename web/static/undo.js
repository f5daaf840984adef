// Undo and redo of the edits the page makes to the list (a suggestion
// applied, safe fixes, a code added from the search, the demo list, a file
// read in). Each step keeps the text before and after and a note in words.
// Typing in the list is the browser's own to undo; an undo here restores the
// text before the page's edit and keeps the text it replaces for redo, so
// typing done since is never lost.

const LIMIT = 200;

export class EditHistory {
  constructor() {
    this.done = []; // {before, after, note}
    this.undone = [];
  }

  /** Record an edit the page made. */
  record(before, after, note) {
    if (before === after) return;
    this.done.push({ before, after, note });
    if (this.done.length > LIMIT) this.done.shift();
    this.undone = [];
  }

  canUndo() {
    return this.done.length > 0;
  }

  canRedo() {
    return this.undone.length > 0;
  }

  /** The text after the last edit the page made, or null. */
  lastAfter() {
    return this.done.length ? this.done[this.done.length - 1].after : null;
  }

  /** Undo the last step: returns {text, note} to show, or null. `now` is the list as it is. */
  undo(now) {
    const step = this.done.pop();
    if (!step) return null;
    this.undone.push({ before: step.before, after: now, note: step.note });
    return { text: step.before, note: step.note };
  }

  /** Redo the last undone step: returns {text, note}, or null. */
  redo(now) {
    const step = this.undone.pop();
    if (!step) return null;
    this.done.push({ before: now, after: step.after, note: step.note });
    return { text: step.after, note: step.note };
  }

  /** What the next undo and redo would do, in words (for the buttons' descriptions). */
  nextUndo() {
    return this.done.length ? this.done[this.done.length - 1].note : "";
  }

  nextRedo() {
    return this.undone.length ? this.undone[this.undone.length - 1].note : "";
  }
}
