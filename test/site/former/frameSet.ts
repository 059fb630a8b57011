/**
 * Nunjucks 3.2.4's Frame.prototype.set (node_modules/nunjucks/src/runtime.js), kept verbatim
 * (with types) to check src/site/nunjucksFrameSet.ts against it.
 */
interface Frame {
  variables: Record<string, unknown>;
  resolve(name: string, forWrite: boolean): Frame | undefined;
  set(name: string, val: unknown, resolveUp?: boolean): void;
}

export function formerSet(this: Frame, name: string, val: unknown, resolveUp?: boolean): void {
  // Allow variables with dots by automatically creating the
  // nested structure
  var parts = name.split('.');
  var obj = this.variables;
  var frame: Frame | undefined = this;
  if (resolveUp) {
    if (frame = this.resolve(parts[0], true)) {
      frame.set(name, val);
      return;
    }
  }
  for (var i = 0; i < parts.length - 1; i++) {
    var id = parts[i];
    if (!obj[id]) {
      obj[id] = {};
    }
    obj = obj[id] as Record<string, unknown>;
  }
  obj[parts[parts.length - 1]] = val;
}
