/** A picked file: on the web a File; on a device a uri the platform's fetch can send. */
export type PickedFile = { name: string; mimeType?: string | null; uri: string; file?: File | null };

/** Multipart body with the file in the `file` field, as the upload routes expect. */
export function fileForm(picked: PickedFile): FormData {
  const fd = new FormData();
  if (picked.file) fd.append('file', picked.file, picked.name);
  // React Native's FormData accepts a { uri, name, type } descriptor for a file on disk.
  else fd.append('file', { uri: picked.uri, name: picked.name, type: picked.mimeType ?? 'text/csv' } as unknown as Blob);
  return fd;
}
