// Colours of the workbench: the Okabe–Ito palette, distinguishable with the common forms of
// colour blindness (Okabe & Ito 2008, "Color Universal Design").
#pragma once

#include <QColor>

#include <array>

namespace cbui::palette {

inline QColor thisYear() { return QColor(0x00, 0x72, 0xB2); }    // blue
inline QColor lastYear() { return QColor(0xE6, 0x9F, 0x00); }    // orange
inline QColor capacity() { return QColor(0x00, 0x00, 0x00); }    // black
inline QColor readingDate() { return QColor(0xCC, 0x79, 0xA7); } // reddish purple

/// A colour a segment can be given: the Okabe–Ito colours with plain names. Yellow is left out
/// because it fades on white (as in the sample property, core/simulator.cpp).
struct NamedColour {
  const char *hex; ///< "#rrggbb"
  const char *name;
};
inline const std::array<NamedColour, 7> &segmentColours() {
  static const std::array<NamedColour, 7> colours{{{"#0072B2", "Blue"},
                                                   {"#E69F00", "Orange"},
                                                   {"#009E73", "Bluish green"},
                                                   {"#CC79A7", "Reddish purple"},
                                                   {"#56B4E9", "Sky blue"},
                                                   {"#D55E00", "Vermilion"},
                                                   {"#000000", "Black"}}};
  return colours;
}

// Group offer chart.
inline QColor transientDemand() { return QColor(0x00, 0x72, 0xB2); } // blue
inline QColor groupsHeld() { return QColor(0x99, 0x99, 0x99); }      // grey
inline QColor groupOffer() { return QColor(0xD5, 0x5E, 0x00); }      // vermillion
inline QColor displaced() { return QColor(0xCC, 0x79, 0xA7); }       // reddish purple

} // namespace cbui::palette
