// Console output of the start and test commands: one prefix, so people see which step speaks.
export function log(message) {
  console.log(`[tapwright] ${message}`);
}
