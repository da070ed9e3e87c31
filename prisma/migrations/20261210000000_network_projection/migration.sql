-- AlterTable
ALTER TABLE "Network" ADD COLUMN     "utmHemisphere" TEXT,
ADD COLUMN     "utmZone" INTEGER;

