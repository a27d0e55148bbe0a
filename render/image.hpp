// Images: linear float RGB in memory; sRGB PNG and a plain linear float
// format (PFM) on disk, both written atomically.
#pragma once
#include <string>
#include <vector>

#include "core/vec.hpp"

namespace dm {

/// A linear-light RGB image, row 0 at the top.
struct Image {
  int width = 0, height = 0;
  std::vector<float> rgb;  ///< 3 floats per pixel, row-major

  Image() = default;
  Image(int w, int h, Rgb fill = {});
  Rgb at(int x, int y) const;
  void set(int x, int y, const Rgb& c);
};

/// PNG bytes (8-bit sRGB, IEC 61966-2-1 transfer) of an image. Throws
/// std::domain_error on a NaN or infinite channel.
std::string encodePng(const Image& img);
/// PFM bytes (linear float RGB, little-endian, bottom row first); throws
/// std::domain_error on a NaN or infinite channel.
std::string encodePfm(const Image& img);
/// The image as 8-bit sRGB bytes (IEC 61966-2-1 transfer, the same bytes a
/// PNG of it holds) with an opaque alpha, 4 per pixel, row 0 first: what a
/// GL texture upload takes.
std::vector<unsigned char> srgbaBytes(const Image& img);
/// Writes an image as 8-bit sRGB PNG, atomically.
void writePng(const std::string& path, const Image& img);
/// Reads an 8-bit RGB or RGBA PNG back into linear light (for tests).
Image readPng(const std::string& path);
/// Writes linear float RGB as a PFM file (little-endian, bottom row first), atomically.
void writePfm(const std::string& path, const Image& img);

}  // namespace dm
