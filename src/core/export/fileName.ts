// File names built from lot and wafer ids: ids come from tester files and may hold anything, so
// keep letters, digits, dot, dash and underscore, never a path separator, a leading dot or a
// name Windows reserves (Microsoft, "Naming Files, Paths, and Namespaces").

const RESERVED = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])(\..*)?$/i;

export function safeFileName(base: string, extension: string): string {
  let name = base.normalize('NFKC').replace(/[^\p{L}\p{N}._-]+/gu, '_').replace(/_+/g, '_').replace(/^[._]+|[._]+$/g, '');
  if (name === '' ) name = 'offstate';
  if (RESERVED.test(name)) name = `_${name}`;
  name = name.slice(0, 120);
  const ext = extension.replace(/[^a-z0-9]/gi, '').toLowerCase();
  return ext ? `${name}.${ext}` : name;
}
