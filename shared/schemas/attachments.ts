/** A stored photo as the API returns it; the bytes are at `url`. */
export type AttachmentJson = {
  id: number;
  fileName: string;
  mimeType: string;
  sizeBytes: number;
  url: string;
  createdAt: string;
};
