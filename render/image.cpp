#include "render/image.hpp"

#include <cmath>
#include <cstdio>
#include <cstring>
#include <stdexcept>

#include <png.h>

#include "core/colour.hpp"
#include "core/io.hpp"

namespace dm {

Image::Image(int w, int h, Rgb fill) : width(w), height(h), rgb(std::size_t(w) * std::size_t(h) * 3) {
  for (std::size_t i = 0; i < rgb.size(); i += 3) {
    rgb[i] = float(fill.r);
    rgb[i + 1] = float(fill.g);
    rgb[i + 2] = float(fill.b);
  }
}

Rgb Image::at(int x, int y) const {
  const std::size_t i = (std::size_t(y) * std::size_t(width) + std::size_t(x)) * 3;
  return {rgb[i], rgb[i + 1], rgb[i + 2]};
}

void Image::set(int x, int y, const Rgb& c) {
  const std::size_t i = (std::size_t(y) * std::size_t(width) + std::size_t(x)) * 3;
  rgb[i] = float(c.r);
  rgb[i + 1] = float(c.g);
  rgb[i + 2] = float(c.b);
}

namespace {

void appendBytes(png_structp png, png_bytep data, png_size_t n) {
  auto* out = static_cast<std::string*>(png_get_io_ptr(png));
  out->append(reinterpret_cast<const char*>(data), n);
}

}  // namespace

namespace {

// Refuses an image with a NaN or infinite channel: like fmt for text, no
// non-finite number may reach a file (and NaN has no PNG byte).
void requireFinite(const Image& img) {
  for (float v : img.rgb)
    if (!std::isfinite(v)) throw std::domain_error("a non-finite pixel reached an image output");
}

}  // namespace

std::string encodePng(const Image& img) {
  if (img.width <= 0 || img.height <= 0) throw std::invalid_argument("empty image");
  requireFinite(img);
  std::string out;
  png_structp png = png_create_write_struct(PNG_LIBPNG_VER_STRING, nullptr, nullptr, nullptr);
  png_infop info = png_create_info_struct(png);
  if (setjmp(png_jmpbuf(png))) {
    png_destroy_write_struct(&png, &info);
    throw std::runtime_error("PNG encoding failed");
  }
  png_set_write_fn(png, &out, appendBytes, nullptr);
  png_set_IHDR(png, info, png_uint_32(img.width), png_uint_32(img.height), 8, PNG_COLOR_TYPE_RGB, PNG_INTERLACE_NONE,
               PNG_COMPRESSION_TYPE_DEFAULT, PNG_FILTER_TYPE_DEFAULT);
  png_set_sRGB(png, info, PNG_sRGB_INTENT_PERCEPTUAL);
  png_write_info(png, info);
  std::vector<png_byte> row(std::size_t(img.width) * 3);
  for (int y = 0; y < img.height; ++y) {
    for (int x = 0; x < img.width * 3; ++x)
      row[std::size_t(x)] = png_byte(std::lround(linearToSrgb(img.rgb[std::size_t(y) * std::size_t(img.width) * 3 + std::size_t(x)]) * 255.0));
    png_write_row(png, row.data());
  }
  png_write_end(png, nullptr);
  png_destroy_write_struct(&png, &info);
  return out;
}

std::vector<unsigned char> srgbaBytes(const Image& img) {
  std::vector<unsigned char> bytes(std::size_t(img.width) * std::size_t(img.height) * 4);
  for (std::size_t pixel = 0; pixel < bytes.size() / 4; ++pixel) {
    for (std::size_t ch = 0; ch < 3; ++ch)
      bytes[pixel * 4 + ch] = static_cast<unsigned char>(std::lround(linearToSrgb(img.rgb[pixel * 3 + ch]) * 255.0));
    bytes[pixel * 4 + 3] = 255;
  }
  return bytes;
}

void writePng(const std::string& path, const Image& img) { writeFileAtomic(path, encodePng(img)); }

Image readPng(const std::string& path) {
  png_image pi;
  std::memset(&pi, 0, sizeof pi);
  pi.version = PNG_IMAGE_VERSION;
  if (!png_image_begin_read_from_file(&pi, path.c_str())) throw std::runtime_error("cannot read PNG " + path);
  pi.format = PNG_FORMAT_RGB;
  std::vector<png_byte> buf(PNG_IMAGE_SIZE(pi));
  if (!png_image_finish_read(&pi, nullptr, buf.data(), 0, nullptr)) throw std::runtime_error("cannot decode PNG " + path);
  Image img(int(pi.width), int(pi.height));
  for (std::size_t i = 0; i < buf.size(); ++i) img.rgb[i] = float(srgbToLinear(buf[i] / 255.0));
  return img;
}

std::string encodePfm(const Image& img) {
  requireFinite(img);
  std::string out = "PF\n" + std::to_string(img.width) + " " + std::to_string(img.height) + "\n-1.0\n";
  for (int y = img.height - 1; y >= 0; --y)
    out.append(reinterpret_cast<const char*>(&img.rgb[std::size_t(y) * std::size_t(img.width) * 3]),
               std::size_t(img.width) * 3 * sizeof(float));
  return out;
}

void writePfm(const std::string& path, const Image& img) { writeFileAtomic(path, encodePfm(img)); }

}  // namespace dm
