// The name cells use for a CSV data table; shared by the server and the editor (no dependencies).

export function reserved(name: string): boolean {
  return name in Object.prototype || name === 'prototype' || name === '__proto__';
}

/** The name cells use for a table: the file name without extension, as an identifier. */
export function tableNameFor(fileName: string): string {
  let name = fileName
    .replace(/\.[A-Za-z0-9]+$/, '')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '');
  if (!/^[A-Za-z]/.test(name)) name = `table_${name}`.replace(/_+$/, '');
  name = name.slice(0, 40).replace(/_+$/, '');
  if (reserved(name)) name = `table_${name}`;
  return name;
}
