#include "cli/flag_values.h"

namespace sp::cli {

std::optional<double> number_flag(const std::optional<std::string>& text, std::string_view field,
                                  const validate::FieldNames& names) {
  if (!text) return std::nullopt;
  double v = 0;
  if (!validate::parse_number(*text, v)) validate::not_a_number(*text, field, names);
  return v;
}

const validate::TableNames& rig_flag_names() {
  static const validate::TableNames names({
      {"name", "--name"},
      {"tow_vehicle.label", "--vehicle"},
      {"tow_vehicle.wheelbase", "--wheelbase"},
      {"tow_vehicle.rear_axle_to_ball", "--rear-axle-to-ball"},
      {"tow_vehicle.gvwr", "--gvwr"},
      {"tow_vehicle.front_gawr", "--front-gawr"},
      {"tow_vehicle.rear_gawr", "--rear-gawr"},
      {"tow_vehicle.gcwr", "--gcwr"},
      {"tow_vehicle.hitch_tongue_rating", "--hitch-tongue-rating"},
      {"tow_vehicle.hitch_trailer_rating", "--hitch-trailer-rating"},
      {"tow_vehicle.falr_target", "--falr-target"},
      {"trailer.label", "--trailer"},
      {"trailer.ball_to_axle", "--ball-to-axle"},
      {"trailer.gvwr", "--trailer-gvwr"},
      {"trailer.axle_gawr", "--trailer-axle-gawr"},
  });
  return names;
}

const validate::TableNames& scale_flag_names() {
  static const validate::TableNames names({
      {"id", "--id"},
      {"name", "--name"},
      {"location", "--location"},
      {"division", "--division"},
      {"capacity", "--capacity"},
      {"accuracy_class", "--class"},
      {"last_inspected", "--inspected"},
      {"reading_uncertainty", "--reading-uncertainty"},
  });
  return names;
}

const validate::TableNames& pass_flag_names() {
  static const validate::TableNames names({
      {"ticket", "--ticket"},
      {"setting", "--setting"},
      {"weighed_at", "--weighed-at"},
      {"steer", "--steer"},
      {"drive", "--drive"},
      {"trailer", "--trailer"},
      {"gross", "--gross"},
      {"scale_id", "--ticket-scale"},
      {"entered_by", "--by"},
  });
  return names;
}

}  // namespace sp::cli
