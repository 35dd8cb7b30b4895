import { useQuery } from "@tanstack/react-query";

export type UploadProgress = {
  id: string;
  fileName: string;
  phase: string;
  rowsDone: number;
  rowsTotal: number | null;
  error: string | null;
  importBatchId: number | null;
};

/** Polls /api/imports/:uploadId while a check or commit runs. */
export function useUploadProgress(uploadId: string, active: boolean) {
  return useQuery({
    queryKey: ["/api/imports", uploadId],
    queryFn: async (): Promise<UploadProgress> => {
      const response = await fetch(`/api/imports/${uploadId}`, { headers: { Accept: "application/json" } });
      if (!response.ok) throw new Error(`progress: ${response.status}`);
      return response.json();
    },
    enabled: active,
    refetchInterval: active ? 400 : false,
    staleTime: 0,
  });
}
