/** The SWR fetcher of the app's own GET routes: JSON, or an error carrying the HTTP status. */
export async function fetchJson<T = unknown>(url: string): Promise<T> {
  const response = await fetch(url);
  if (!response.ok) throw new Error(`HTTP ${response.status}`);
  return (await response.json()) as T;
}
