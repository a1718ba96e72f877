#include "store/stored_failure.h"

namespace manicule::store {

std::string failure_to_store(const std::string& message, const std::string& path) {
  if (!path.empty() && message.size() > path.size() && message.compare(0, path.size(), path) == 0 &&
      message[path.size()] == ':')
    return message.substr(path.size());
  return message;
}

std::string failure_for(const std::string& stored, const std::string& path) {
  return !stored.empty() && stored.front() == ':' ? path + stored : stored;
}

}  // namespace manicule::store
