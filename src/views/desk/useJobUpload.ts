import { ref, type Ref } from 'vue';
import { uploadDesignJob } from '@/api/designs';
import { isApiError } from '@/api/http';
import { errorMessage, showSuccess } from '@/utils/message';

/** One problem of a refused job file, ready to show: where (line, column) and what. */
export interface JobUploadProblem {
  where: string;
  message: string;
}

/**
 * Uploading a job file from the Design desk: saves pending edits first (the upload is a save of the design under
 * the same version lock), sends the file, then reloads the design so the editor shows the new points.
 * @param options.designId - the design
 * @param options.prepare - flushes the autosave and returns the current version
 * @param options.reload - reloads the design after a successful upload
 * @returns `isUploading`, `problems` (line/column messages of a refused file) and `upload(file)`
 */
export function useJobUpload(options: { designId: Ref<number>; prepare: () => Promise<number | undefined>; reload: () => Promise<void> }) {
  const isUploading = ref(false);
  const problems = ref<JobUploadProblem[]>([]);

  /**
   * Sends a CSV file as the design's job.
   * @param file - the chosen file
   */
  async function upload(file: File): Promise<void> {
    isUploading.value = true;
    problems.value = [];
    try {
      const version = await options.prepare();
      if (version === undefined) return;
      const out = await uploadDesignJob(options.designId.value, file, version);
      await options.reload();
      showSuccess(`Job read from ${file.name}: ${out.job.pointCount} point${out.job.pointCount === 1 ? '' : 's'}.`);
    } catch (err) {
      if (isApiError(err) && err.details.length) {
        problems.value = err.details.map((d) => {
          const extra = d as unknown as { line?: number | null; column?: string | null };
          const where = [extra.line ? `line ${extra.line}` : null, extra.column ?? null].filter(Boolean).join(', ');
          return { where: where ? `${where}:` : '', message: d.message };
        });
      } else {
        problems.value = [{ where: '', message: errorMessage(err, 'The job file could not be uploaded.') }];
      }
    } finally {
      isUploading.value = false;
    }
  }

  return { isUploading, problems, upload };
}
