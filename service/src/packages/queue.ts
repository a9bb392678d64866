export const PACKAGE_QUEUE = 'packages';

/** One package job per package row; the job id is the package id. */
export interface PackageJobData {
  packageId: string;
}
