import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { ApiError } from '@/api/http';
import type { Attachment, AttachmentPage } from '@/api/attachments';
import DesignAttachmentsPanel from '@/components/attachments/DesignAttachmentsPanel.vue';

vi.mock('@/api/attachments', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/attachments')>()),
  listAttachments: vi.fn(),
  uploadAttachment: vi.fn(),
  deleteAttachment: vi.fn(),
}));
vi.mock('@/utils/message', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/utils/message')>()),
  confirmAction: vi.fn(),
  showSuccess: vi.fn(),
}));
const api = vi.mocked(await import('@/api/attachments'));
const message = vi.mocked(await import('@/utils/message'));

vi.setConfig({ testTimeout: 60_000 });

function attachment(id: number, fileName: string, extra: Partial<Attachment> = {}): Attachment {
  return {
    id,
    designId: 7,
    partId: null,
    fileName,
    mime: 'application/pdf',
    size: 245_760,
    sha256: 'ef'.repeat(32),
    uploadedBy: { id: 3, name: 'Dana Designer' },
    createdAt: '2026-03-01T10:00:00Z',
    url: `/api/attachments/${id}`,
    canDelete: true,
    ...extra,
  };
}

const page = (items: Attachment[], canUpload = true): AttachmentPage => ({ items, total: items.length, page: 1, pageSize: 50, canUpload });

async function mountPanel() {
  const wrapper = mount(DesignAttachmentsPanel, { props: { designId: 7 }, attachTo: document.body });
  await flushPromises();
  return wrapper;
}

async function chooseFile(wrapper: Awaited<ReturnType<typeof mountPanel>>, file: File) {
  const input = wrapper.get<HTMLInputElement>('[data-test="attachment-upload"] input[type="file"]');
  Object.defineProperty(input.element, 'files', { value: [file], configurable: true });
  await input.trigger('change');
  await flushPromises();
}

const rows = (wrapper: Awaited<ReturnType<typeof mountPanel>>) => wrapper.findAll('[data-test="attachment-row"]');

describe('DesignAttachmentsPanel', () => {
  beforeEach(() => {
    vi.resetAllMocks();
  });

  it('when the design has files, then each is listed with its kind, size, uploader and a download link', async () => {
    // Arrange
    api.listAttachments.mockResolvedValue(
      page([
        attachment(1, 'motor-datasheet.pdf'),
        attachment(2, 'frame.png', { mime: 'image/png', size: 2_411_724, uploadedBy: null, canDelete: false }),
      ]),
    );
    // Act
    const wrapper = await mountPanel();
    // Assert
    expect(api.listAttachments).toHaveBeenCalledWith(7);
    expect(rows(wrapper).map((r) => r.attributes('data-name'))).toEqual(['motor-datasheet.pdf', 'frame.png']);
    const [pdf, png] = rows(wrapper);
    expect(pdf.get('[data-test="attachment-download"]').attributes('href')).toBe('/api/attachments/1');
    expect(pdf.text()).toContain('PDF · 240 kB · Dana Designer');
    expect(png.text()).toContain('PNG · 2.3 MB · —');
    expect(pdf.find('[data-test="attachment-delete"]').exists()).toBe(true);
    expect(png.find('[data-test="attachment-delete"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when the design has no files, then says so', async () => {
    api.listAttachments.mockResolvedValue(page([]));
    const wrapper = await mountPanel();
    expect(wrapper.get('[data-test="attachments-empty"]').text()).toBe('No files attached yet.');
    expect(wrapper.find('[data-test="attachments-list"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when the user may not upload, then no upload button is offered', async () => {
    api.listAttachments.mockResolvedValue(page([attachment(1, 'a.pdf')], false));
    const wrapper = await mountPanel();
    expect(wrapper.find('[data-test="attachment-upload"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when delete is confirmed, then the API deletes that file and the list is reloaded', async () => {
    // Arrange
    api.listAttachments.mockResolvedValueOnce(
      page([attachment(1, 'motor-datasheet.pdf'), attachment(2, 'notes.csv', { mime: 'text/csv' })]),
    );
    api.listAttachments.mockResolvedValueOnce(page([attachment(2, 'notes.csv', { mime: 'text/csv' })]));
    api.deleteAttachment.mockResolvedValue(undefined);
    message.confirmAction.mockResolvedValue(true);
    const wrapper = await mountPanel();
    // Act
    await rows(wrapper)[0].get('[data-test="attachment-delete"]').trigger('click');
    await flushPromises();
    // Assert
    expect(message.confirmAction).toHaveBeenCalledWith(
      expect.objectContaining({ message: 'Delete "motor-datasheet.pdf" from this design?', isDanger: true }),
    );
    expect(api.deleteAttachment).toHaveBeenCalledWith(1);
    expect(rows(wrapper).map((r) => r.attributes('data-name'))).toEqual(['notes.csv']);
    expect(message.showSuccess).toHaveBeenCalledWith('Deleted motor-datasheet.pdf.');
    wrapper.unmount();
  });

  it('when delete is cancelled, then nothing is deleted', async () => {
    api.listAttachments.mockResolvedValue(page([attachment(1, 'motor-datasheet.pdf')]));
    message.confirmAction.mockResolvedValue(false);
    const wrapper = await mountPanel();
    await wrapper.get('[data-test="attachment-delete"]').trigger('click');
    await flushPromises();
    expect(message.confirmAction).toHaveBeenCalled();
    expect(api.deleteAttachment).not.toHaveBeenCalled();
    expect(rows(wrapper)).toHaveLength(1);
    wrapper.unmount();
  });

  it('when deleting fails, then the error is shown and the file stays listed', async () => {
    api.listAttachments.mockResolvedValue(page([attachment(1, 'motor-datasheet.pdf')]));
    api.deleteAttachment.mockRejectedValue(new ApiError(403, 'forbidden', 'Only the design’s owner or an admin may delete its files.'));
    message.confirmAction.mockResolvedValue(true);
    const wrapper = await mountPanel();
    await wrapper.get('[data-test="attachment-delete"]').trigger('click');
    await flushPromises();
    expect(wrapper.get('[data-test="attachment-error"]').text()).toContain('Only the design’s owner or an admin may delete its files.');
    expect(rows(wrapper)).toHaveLength(1);
    wrapper.unmount();
  });

  it('when a file is chosen, then it is uploaded to this design and the list is reloaded', async () => {
    // Arrange
    api.listAttachments.mockResolvedValueOnce(page([]));
    api.listAttachments.mockResolvedValueOnce(page([attachment(5, 'idler.pdf')]));
    api.uploadAttachment.mockResolvedValue(attachment(5, 'idler.pdf'));
    const wrapper = await mountPanel();
    const file = new File(['%PDF-1.4'], 'idler.pdf', { type: 'application/pdf' });
    // Act
    await chooseFile(wrapper, file);
    // Assert
    expect(api.uploadAttachment).toHaveBeenCalledWith(7, file);
    expect(rows(wrapper).map((r) => r.attributes('data-name'))).toEqual(['idler.pdf']);
    expect(message.showSuccess).toHaveBeenCalledWith('Attached idler.pdf.');
    wrapper.unmount();
  });

  it('when the server refuses the upload, then its message is shown', async () => {
    // Arrange
    api.listAttachments.mockResolvedValue(page([]));
    api.uploadAttachment.mockRejectedValue(new ApiError(415, 'unsupported_type', 'Only PDF, PNG, JPEG and CSV files can be attached.'));
    const wrapper = await mountPanel();
    // Act
    await chooseFile(wrapper, new File(['MZ'], 'tool.exe', { type: 'application/octet-stream' }));
    // Assert
    expect(wrapper.get('[data-test="attachment-error"]').text()).toContain('Only PDF, PNG, JPEG and CSV files can be attached.');
    expect(message.showSuccess).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('when the file is larger than 10 MB, then says so without uploading', async () => {
    api.listAttachments.mockResolvedValue(page([]));
    const wrapper = await mountPanel();
    await chooseFile(wrapper, new File([new Uint8Array(10 * 1024 * 1024 + 1)], 'scan.pdf', { type: 'application/pdf' }));
    expect(wrapper.get('[data-test="attachment-error"]').text()).toContain('"scan.pdf" is too large: at most 10 MB is accepted.');
    expect(api.uploadAttachment).not.toHaveBeenCalled();
    wrapper.unmount();
  });
});
