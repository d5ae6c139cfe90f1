/**
 * Reading and writing volumes: the format readers (NIfTI-1/2, NRRD, MetaImage, TIFF/PNG through
 * ImageJ) behind {@link org.accordia.io.Volumes}, the bounded payload decoder, the NIfTI writer,
 * and the volume model ({@link org.accordia.io.Geometry}, {@link org.accordia.io.LabelVolume},
 * {@link org.accordia.io.ImageVolume}). Bad input is an {@link org.accordia.io.InputException}.
 *
 * <p>Public API: {@code Volumes}, {@code VolumeReader}, {@code ReadLimits}, {@code Geometry},
 * {@code LabelVolume}, {@code ImageVolume}, {@code SampleType}, {@code InputException},
 * {@code NiftiWriter}. The individual readers, {@code Payload}, {@code TextHeaders},
 * {@code Quaternions} and {@code ZeroRunGzipOutputStream} are implementation (public for the
 * fuzz targets and tests). Depends on nothing else of the project.
 */
package org.accordia.io;
