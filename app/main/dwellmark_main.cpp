#include "app/cli.hpp"

#ifdef DWELLMARK_HAVE_GUI
#include "app/gui/gui.hpp"
#include "app/gui/snapshot.hpp"
#endif

int main(int argc, char** argv) {
#ifdef DWELLMARK_HAVE_GUI
  return dm::app::runCli(argc, argv, dm::gui::runGui, dm::gui::runSnapshot);
#else
  return dm::app::runCli(argc, argv);
#endif
}
