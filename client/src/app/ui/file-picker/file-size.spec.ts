import { fileSizeProblem, formatFileSize } from './file-size';

function fileOf(name: string, size: number): File {
  const file = new File(['x'], name);
  Object.defineProperty(file, 'size', { value: size });
  return file;
}

describe('formatFileSize', () => {
  it('bytes below 1 kB, kB with one decimal below 10 kB, MB with one decimal (worked by hand in this test)', () => {
    expect(formatFileSize(80, 'en-US')).toBe('80 bytes');
    expect(formatFileSize(2500, 'en-US')).toBe('2.4 kB'); // 2500 / 1024 = 2.44
    expect(formatFileSize(482_304, 'en-US')).toBe('471 kB'); // 482304 / 1024 = 471.0
    expect(formatFileSize(3.5 * 1024 * 1024, 'en-US')).toBe('3.5 MB');
  });
});

describe('fileSizeProblem', () => {
  const MB = 1024 * 1024;

  it('a file of exactly the limit passes; a larger one is refused naming the file, its size and the limit', () => {
    expect(fileSizeProblem(fileOf('case.pdf', 10 * MB), 10 * MB, 'en-US')).toBeNull();
    // One byte over: both round to 10 MB, so the sentence does not repeat the size.
    expect(fileSizeProblem(fileOf('case.pdf', 10 * MB + 1), 10 * MB, 'en-US')).toBe(
      'case.pdf is larger than the 10 MB allowed. Choose a smaller file.',
    );
    expect(fileSizeProblem(fileOf('members.csv', 12 * MB), 5 * MB, 'en-US')).toBe(
      'members.csv is 12 MB, more than the 5 MB allowed. Choose a smaller file.',
    );
  });
});
