/** Hex SHA-256 (Web Crypto), recorded beside photos and traces so the server can check the upload. */
export async function sha256HexOfBuffer(data: ArrayBuffer): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', data);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

export async function sha256Hex(blob: Blob): Promise<string> {
  return sha256HexOfBuffer(await blob.arrayBuffer());
}
