#include "core/request.h"

namespace manicule {

SelectionRules Request::selection_rules() const {
  SelectionRules rules = SelectionRules::make(unit, preset);
  for (const auto& name : keep) rules.keep(name);
  for (const auto& name : drop) rules.drop(name);
  rules.joint = joint;
  rules.base_witness = base_witness;
  rules.default_language = default_language;
  return rules;
}

}  // namespace manicule
